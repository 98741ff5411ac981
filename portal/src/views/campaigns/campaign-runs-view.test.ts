import type { Run } from '@localis/shared';
import { flushPromises } from '@vue/test-utils';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { toLocalInput } from '../../lib/local-datetime';
import { jsonResponse as json, notServed, stubFetch } from '../../test/fetch-stub';
import { mountPage, resetTestPage } from '../../test/mount-in-app';
import CampaignRunsView from './campaign-runs-view.vue';
import { CAN_NOTHING, campaignFixture, testRouter } from './test/campaign-fixture';

const campaign = campaignFixture({ state: 'granted', can: { ...CAN_NOTHING, recordRuns: true } });
const BASE = `/api/v1/campaigns/${campaign.id}`;

const recorded: Run = {
  id: '5f0c1a2b-3c4d-4e5f-8a9b-0c1d2e3f4a5b',
  campaignId: campaign.id,
  externalJobId: '981234',
  machine: 'cluster-a',
  startedAt: '2027-02-01T08:00:00.000Z',
  endedAt: '2027-02-01T20:00:00.000Z',
  cores: 64,
  coreHours: 768,
  refundedCoreHours: 100,
  codeName: 'tmm-kernel',
  codeVersion: '1.4.2',
  parameters: { sizes: [8, 12, 16], disorder: [16.5], energies: [0], seeds: [1, 2] },
  source: 'import',
  recordedByName: 'Ilse Marrow',
  createdAt: '2027-02-02T09:00:00.000Z',
};

let requests: { method: string; url: string; body: unknown }[];

function serve(url: string, init?: RequestInit): Response {
  const method = init?.method ?? 'GET';
  const body = init?.body ? (JSON.parse(String(init.body)) as Record<string, unknown>) : undefined;
  requests.push({ method, url, body });
  if (url === BASE) return json(200, campaign);
  if (url.startsWith(`${BASE}/runs`) && method === 'GET') return json(200, { items: [recorded], total: 1, limit: 25, offset: 0 });
  if (url === `${BASE}/runs` && method === 'POST') return json(201, { ...recorded, ...body, id: '6a1b2c3d-4e5f-4a6b-8c7d-9e0f1a2b3c4d', coreHours: 12, refundedCoreHours: 0, source: 'portal' });
  return notServed(url);
}

async function mountRuns(query = '') {
  const router = testRouter({ path: '/campaigns/:id/runs', name: 'campaign-runs', component: CampaignRunsView, props: true });
  const host = await mountPage(router, `/campaigns/${campaign.id}/runs${query}`);
  return { wrapper: host.getComponent(CampaignRunsView), router };
}

describe('CampaignRunsView', { timeout: 20_000 }, () => {
  beforeEach(() => {
    requests = [];
    stubFetch(serve);
  });

  afterEach(resetTestPage);

  describe('the table', () => {
    it('should ask for the filters in the address and show the runs with their parameters and refunds', async () => {
      const { wrapper } = await mountRuns('?q=9812&sort=coreHours');
      const list = requests.find((r) => r.url.startsWith(`${BASE}/runs?`));
      expect(list?.url).toContain('q=9812');
      expect(list?.url).toContain('sort=coreHours');
      const row = wrapper.get('[data-testid="runs-table"] tbody tr').text();
      expect(row).toContain('981234');
      expect(row).toContain('768 core-hours');
      expect(row).toContain('100 core-hours refunded');
      expect(row).toContain('L 8–16 (3) · W 16.5 · E 0 · 2 seeds');
      expect(wrapper.get('[data-testid="runs-csv"]').attributes('href')).toContain('format=csv');
    });

    it('should say what is wrong with a hand-edited time instead of asking the server', async () => {
      const { wrapper } = await mountRuns('?from=yesterday');
      expect(wrapper.text()).toContain('from must be a date and time');
      expect(requests.some((r) => r.url.startsWith(`${BASE}/runs?`))).toBe(false);
    });
  });

  describe('recording a run', () => {
    it('should send the run with the machine of the campaign and the parameter lists as numbers', async () => {
      const { wrapper } = await mountRuns();
      await wrapper.get('[data-testid="record-run"]').trigger('click');
      await flushPromises();
      expect((wrapper.get('[data-testid="run-machine"]').element as HTMLInputElement).value).toBe('cluster-a');

      await wrapper.get('[data-testid="run-job"]').setValue('981300');
      await wrapper.get('[data-testid="run-started"]').setValue(toLocalInput('2027-02-03T08:00:00Z'));
      await wrapper.get('[data-testid="run-ended"]').setValue(toLocalInput('2027-02-03T11:00:00Z'));
      const cores = wrapper.get('#run-cores');
      await cores.setValue('4');
      await cores.trigger('input');
      await cores.trigger('blur');
      await flushPromises();
      expect(document.body.textContent).toContain('cores × wall-clock = 12 core-hours (3 h)');

      await wrapper.get('[data-testid="run-code"]').setValue('tmm-kernel');
      await wrapper.get('[data-testid="run-version"]').setValue('1.5.0');
      await wrapper.get('[data-testid="run-sizes"]').setValue('8, 12 16');
      await wrapper.get('[data-testid="run-seeds"]').setValue('x');
      await wrapper.get('#record-run-form').trigger('submit');
      await flushPromises();
      expect(document.body.textContent).toContain('Use numbers separated by commas or spaces');
      expect(requests.some((r) => r.method === 'POST')).toBe(false);

      await wrapper.get('[data-testid="run-seeds"]').setValue('1 2');
      await wrapper.get('#record-run-form').trigger('submit');
      await flushPromises();
      expect(requests.find((r) => r.method === 'POST')?.body).toEqual({
        externalJobId: '981300',
        machine: 'cluster-a',
        startedAt: '2027-02-03T08:00:00.000Z',
        endedAt: '2027-02-03T11:00:00.000Z',
        cores: 4,
        codeName: 'tmm-kernel',
        codeVersion: '1.5.0',
        parameters: { sizes: [8, 12, 16], disorder: [], energies: [], seeds: [1, 2] },
      });
      expect(wrapper.findAll('[data-testid="runs-table"] tbody tr')).toHaveLength(2);
    });
  });
});
