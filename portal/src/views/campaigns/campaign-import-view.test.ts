import type { RunImportResult } from '@localis/shared';
import { flushPromises, mount } from '@vue/test-utils';
import { createPinia, setActivePinia } from 'pinia';
import ConfirmationService from 'primevue/confirmationservice';
import PrimeVue from 'primevue/config';
import ToastService from 'primevue/toastservice';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { defineComponent } from 'vue';
import { createMemoryHistory, createRouter } from 'vue-router';
import CampaignImportView from './campaign-import-view.vue';
import ImportMapping from './components/import/import-mapping.vue';
import { campaignFixture } from './test/campaign-fixture';

const campaign = campaignFixture({
  state: 'granted',
  can: { edit: false, submit: false, withdraw: false, startReview: false, decide: false, recordRuns: true, transfer: false },
});
const BASE = `/api/v1/campaigns/${campaign.id}`;
const CSV = 'JobID,Start,End,AllocCPUS,Partition\n981234,2027-02-01T08:00:00,2027-02-01T20:00:00,64,batch\n';

function preview(over: Partial<RunImportResult> = {}): RunImportResult {
  return {
    dryRun: true,
    committed: false,
    columns: ['JobID', 'Start', 'End', 'AllocCPUS', 'Partition'],
    mapping: { JobID: 'externalJobId', Start: 'startedAt', End: 'endedAt', AllocCPUS: 'cores', Partition: null },
    unknownColumns: ['Partition'],
    missingFields: [],
    rows: [{ line: 2, externalJobId: '981234', startedAt: '2027-02-01T08:00:00.000Z', endedAt: '2027-02-01T20:00:00.000Z', cores: 64, coreHours: 768, errors: [], duplicate: null }],
    summary: { rows: 1, valid: 1, withErrors: 0, duplicates: 0, coreHours: 768 },
    ledger: { remaining: 10_000, after: 9_232, allowed: true, overdraft: false },
    runIds: [],
    ...over,
  };
}

const json = (status: number, body: unknown) => new Response(JSON.stringify(body), { status, headers: { 'content-type': 'application/json' } });
/** The requests sent to the import endpoint: the query string and the body. */
let imports: { url: string; body: Record<string, unknown> }[];

function serve(url: string, init?: RequestInit): Response {
  if (url === BASE) return json(200, campaign);
  if (url.startsWith(`${BASE}/runs/import`) && init?.method === 'POST') {
    const body = JSON.parse(String(init.body)) as Record<string, unknown>;
    imports.push({ url, body });
    const mapping = (body.mapping ?? {}) as Record<string, string>;
    const chosen = mapping.Partition === 'ignore';
    const result = preview(chosen ? { unknownColumns: [], mapping: { ...preview().mapping, Partition: 'ignore' } } : {});
    if (url.includes('dryRun=true')) return json(200, result);
    return json(201, { ...result, dryRun: false, committed: true, runIds: ['5f0c1a2b-3c4d-4e5f-8a9b-0c1d2e3f4a5b'] });
  }
  return json(404, { error: { code: 'not_found', message: `no ${url}` } });
}

async function mountWizard() {
  const Blank = defineComponent({ template: '<p>page</p>' });
  const router = createRouter({
    history: createMemoryHistory(),
    routes: [
      { path: '/campaigns', name: 'campaigns', component: Blank },
      { path: '/campaigns/:id', name: 'campaign-detail', component: Blank },
      { path: '/campaigns/:id/ledger', name: 'campaign-ledger', component: Blank },
      { path: '/campaigns/:id/runs', name: 'campaign-runs', component: Blank },
      { path: '/campaigns/:id/runs/import', name: 'campaign-runs-import', component: CampaignImportView, props: true },
    ],
  });
  await router.push(`/campaigns/${campaign.id}/runs/import`);
  await router.isReady();
  const pinia = createPinia();
  setActivePinia(pinia);
  const Host = defineComponent({ template: '<RouterView />' });
  const host = mount(Host, {
    global: { plugins: [pinia, router, [PrimeVue, { theme: 'none' }], ToastService, ConfirmationService], stubs: { teleport: true } },
    attachTo: document.body,
  });
  await flushPromises();
  return host.getComponent(CampaignImportView);
}

const wait = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

describe('CampaignImportView', { timeout: 20_000 }, () => {
  beforeEach(() => {
    imports = [];
    vi.stubGlobal('fetch', vi.fn((url: string, init?: RequestInit) => Promise.resolve(serve(url, init))));
  });

  afterEach(() => {
    vi.unstubAllGlobals();
    document.body.innerHTML = '';
  });

  describe('the steps', () => {
    it('should preview, ask for the unknown column, preview again and record the runs only when nothing blocks them', async () => {
      const wrapper = await mountWizard();
      await wrapper.get('[data-testid="import-csv"]').setValue(CSV);
      await wrapper.get('[data-testid="import-code"]').setValue('tmm-kernel');
      await wrapper.get('[data-testid="import-version"]').setValue('1.4.2');
      await wrapper.get('[data-testid="import-preview"]').trigger('click');
      await flushPromises();

      expect(imports).toHaveLength(1);
      expect(imports[0].url).toContain('dryRun=true');
      expect(imports[0].body).toEqual({ csv: CSV, defaults: { codeName: 'tmm-kernel', codeVersion: '1.4.2' } });
      expect(wrapper.get('[data-testid="import-mapping"]').text()).toContain('Choose a field');
      expect(wrapper.get('[data-testid="import-continue"]').attributes('disabled')).toBeDefined();
      expect(wrapper.get('[data-testid="import-summary"]').text()).toContain('768 core-hours');

      wrapper.getComponent(ImportMapping).vm.$emit('choose', 'Partition', 'ignore');
      await wait(400);
      await flushPromises();

      expect(imports).toHaveLength(2);
      expect(imports[1].body.mapping).toEqual({ Partition: 'ignore' });
      expect(wrapper.get('[data-testid="import-continue"]').attributes('disabled')).toBeUndefined();

      await wrapper.get('[data-testid="import-continue"]').trigger('click');
      await flushPromises();
      await wrapper.get('[data-testid="import-commit"]').trigger('click');
      await flushPromises();

      expect(imports).toHaveLength(3);
      expect(imports[2].url).not.toContain('dryRun');
      expect(wrapper.get('[data-testid="import-done"]').text()).toContain('1 run recorded');
    });

    it('should keep the check and the later steps closed while there is no file', async () => {
      const wrapper = await mountWizard();
      expect(wrapper.get('[data-testid="import-preview"]').attributes('disabled')).toBeDefined();
      expect(wrapper.get('[data-testid="import-step-preview"] button').attributes('disabled')).toBeDefined();
      expect(imports).toHaveLength(0);
    });
  });
});
