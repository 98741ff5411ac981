import type { Round, RoundUsage } from '@localis/shared';
import { flushPromises, mount } from '@vue/test-utils';
import { createPinia, setActivePinia } from 'pinia';
import PrimeVue from 'primevue/config';
import ToastService from 'primevue/toastservice';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { defineComponent } from 'vue';
import { createMemoryHistory, createRouter } from 'vue-router';
import RoundUsageView from './round-usage-view.vue';

const ROUND_ID = '9a8b7c6d-5e4f-4a3b-8c2d-1e0f9a8b7c6d';
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
const usage: RoundUsage = {
  roundId: ROUND_ID,
  pools: [
    {
      roundId: ROUND_ID,
      machine: 'cluster-a',
      pool: 10_000,
      granted: 7_000,
      used: 3_100,
      remaining: 3_900,
      unallocated: 3_000,
      groups: [
        { groupId: '66666666-6666-4666-8666-666666666666', groupName: 'Wave transport', granted: 4_000, used: 2_900, remaining: 1_100 },
        { groupId: '77777777-7777-4777-8777-777777777777', groupName: 'Topological phases', granted: 3_000, used: 200, remaining: 2_800 },
      ],
    },
  ],
};

let usageStatus: number;
const json = (status: number, body: unknown) => new Response(JSON.stringify(body), { status, headers: { 'content-type': 'application/json' } });

function serve(url: string): Response {
  if (url === `/api/v1/rounds/${ROUND_ID}/usage`) return usageStatus === 200 ? json(200, usage) : json(usageStatus, { error: { code: 'not_found', message: 'No such round.' } });
  if (url === `/api/v1/rounds/${ROUND_ID}`) return json(200, round);
  return json(404, { error: { code: 'not_found', message: `no ${url}` } });
}

async function mountUsage() {
  const Blank = defineComponent({ template: '<p>page</p>' });
  const router = createRouter({
    history: createMemoryHistory(),
    routes: [
      { path: '/admin/rounds', name: 'admin-rounds', component: Blank },
      { path: '/admin/rounds/:id/usage', name: 'admin-round-usage', component: RoundUsageView, props: true },
    ],
  });
  await router.push(`/admin/rounds/${ROUND_ID}/usage`);
  await router.isReady();
  setActivePinia(createPinia());
  const Host = defineComponent({ template: '<RouterView />' });
  const host = mount(Host, { global: { plugins: [router, [PrimeVue, { theme: 'none' }], ToastService] }, attachTo: document.body });
  await flushPromises();
  return host.getComponent(RoundUsageView);
}

describe('RoundUsageView', { timeout: 20_000 }, () => {
  beforeEach(() => {
    usageStatus = 200;
    vi.stubGlobal('fetch', vi.fn((url: string) => Promise.resolve(serve(url))));
  });

  afterEach(() => {
    vi.unstubAllGlobals();
    document.body.innerHTML = '';
  });

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
