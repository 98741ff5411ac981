import type { Round, RoundUsage } from '@localis/shared';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { jsonResponse as json, notServed, stubFetch } from '../../../test/fetch-stub';
import { memoryRouter, mountPage, resetTestPage } from '../../../test/mount-in-app';
import RoundUsageView from './round-usage-view.vue';
import { POOL_USAGE } from './test/pool-usage-fixture';

const ROUND_ID = POOL_USAGE.roundId;
const round: Round = {
  id: ROUND_ID,
  name: '2027 spring round',
  opensAt: '2027-01-01T00:00:00.000Z',
  closesAt: '2027-03-31T23:59:59.000Z',
  allocationEndsAt: '2028-03-31T23:59:59.000Z',
  overdraftPercent: 10,
  status: 'closed',
  pools: [{ machine: 'cluster-a', coreHours: 10_000 }],
  totalCoreHours: 10_000,
  campaignCount: 2,
  createdAt: '2026-11-01T09:00:00.000Z',
};
const usage: RoundUsage = { roundId: ROUND_ID, pools: [POOL_USAGE] };

let usageStatus: number;

function serve(url: string): Response {
  if (url === `/api/v1/rounds/${ROUND_ID}/usage`) return usageStatus === 200 ? json(200, usage) : json(usageStatus, { error: { code: 'not_found', message: 'No such round.' } });
  if (url === `/api/v1/rounds/${ROUND_ID}`) return json(200, round);
  return notServed(url);
}

async function mountUsage() {
  const router = memoryRouter([
    { path: '/admin/rounds', name: 'admin-rounds' },
    { path: '/admin/rounds/:id/usage', name: 'admin-round-usage', component: RoundUsageView, props: true },
  ]);
  const host = await mountPage(router, `/admin/rounds/${ROUND_ID}/usage`);
  return host.getComponent(RoundUsageView);
}

describe('RoundUsageView', { timeout: 20_000 }, () => {
  beforeEach(() => {
    usageStatus = 200;
    stubFetch(serve);
  });

  afterEach(resetTestPage);

  describe('a pool', () => {
    it('should show the figures, the policy of the round and a table by group', async () => {
      const wrapper = await mountUsage();
      expect(wrapper.get('h1').text()).toBe('Pool usage: 2027 spring round');
      expect(wrapper.text()).toContain('runs may overdraw a grant by up to 10 %');
      const card = wrapper.get('[data-testid="pool-cluster-a"]');
      expect(card.text()).toContain('Unallocated3,000 core-hours');
      expect(card.text()).toContain('70 % of the pool granted, 31 % used.');
      const rows = wrapper.findAll('[data-testid="pool-groups-cluster-a"] tbody tr');
      expect(rows.map((r) => r.find('td').text())).toEqual(['Topological phases', 'Wave transport']);
      expect(rows[1].text()).toContain('73 %');
    });

    it('should say so when the round does not exist', async () => {
      usageStatus = 404;
      const wrapper = await mountUsage();
      expect(wrapper.text()).toContain('There is no round at this address.');
    });
  });
});
