import { flushPromises } from '@vue/test-utils';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { jsonResponse as json, notServed, stubFetch } from '../../test/fetch-stub';
import { mountPage, resetTestPage } from '../../test/mount-in-app';
import CampaignImportView from './campaign-import-view.vue';
import ImportMapping from './components/import/import-mapping.vue';
import { CAN_NOTHING, campaignFixture, testRouter } from './test/campaign-fixture';
import { runImportFixture as preview } from './test/run-import-fixture';

const campaign = campaignFixture({ state: 'granted', can: { ...CAN_NOTHING, recordRuns: true } });
const BASE = `/api/v1/campaigns/${campaign.id}`;
const CSV = 'JobID,Start,End,AllocCPUS,Partition\n981234,2027-02-01T08:00:00,2027-02-01T20:00:00,64,batch\n';

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
  return notServed(url);
}

async function mountWizard() {
  const router = testRouter({ path: '/campaigns/:id/runs/import', name: 'campaign-runs-import', component: CampaignImportView, props: true });
  const host = await mountPage(router, `/campaigns/${campaign.id}/runs/import`);
  return host.getComponent(CampaignImportView);
}

const wait = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

describe('CampaignImportView', { timeout: 20_000 }, () => {
  beforeEach(() => {
    imports = [];
    stubFetch(serve);
  });

  afterEach(resetTestPage);

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
