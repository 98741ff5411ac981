import type { Analysis, Archive, Role, SpotCheck } from '@localis/shared';
import { flushPromises, type VueWrapper } from '@vue/test-utils';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { useSessionStore } from '../../stores/session.store';
import { jsonResponse as json, notServed, stubFetch } from '../../test/fetch-stub';
import { mountPage, resetTestPage } from '../../test/mount-in-app';
import CampaignAnalysisView from './campaign-analysis-view.vue';
import { analysisFixture } from './lib/analysis-fixture';
import { spotCheckFixture } from './lib/spot-check-fixture';
import { archiveFixture } from './test/archive-store-fake';
import { CAN_NOTHING, campaignFixture, testRouter } from './test/campaign-fixture';

const API = '/api/v1';
const campaign = campaignFixture({
  state: 'granted',
  spec: { ...campaignFixture().spec, sizes: [6, 8, 10, 12, 16], energies: [0, 0.5] },
  can: { ...CAN_NOTHING, recordRuns: true, uploadResults: true },
});
const LIST = `${API}/campaigns/${campaign.id}/analyses`;
const SPOT_CHECKS = `${API}/campaigns/${campaign.id}/spot-checks`;

const earlier = analysisFixture({ createdAt: '2027-03-01T09:22:00.000Z', finishedAt: '2027-03-01T09:22:09.000Z', requestedByName: null });
const latest = analysisFixture({
  createdAt: '2027-03-02T10:00:00.000Z',
  finishedAt: '2027-03-02T10:00:12.000Z',
  requestedByName: 'Ilse Marrow',
  request: { orders: { nr: 2, ni: 0, mr: 1, mi: 0 }, bootstrap: 20 },
});
latest.result!.model.chosenBy = 'user';

/** The api's analysis routes in process: the list, one analysis, and POST, which queues. */
class AnalysisApiFake {
  analyses: Analysis[] = [];
  archives: Archive[] = [archiveFixture()];
  spotChecks: SpotCheck[] = [];
  posted: unknown[] = [];
  campaign = campaign;
  fetch = stubFetch((url, init) => this.serve(url, init));

  private serve(url: string, init?: RequestInit): Response {
    const method = init?.method ?? 'GET';
    if (url === `${API}/campaigns/${campaign.id}`) return json(200, this.campaign);
    if (url === `${API}/campaigns/${campaign.id}/archives`) return json(200, { items: this.archives });
    if (url === LIST && method === 'GET') return json(200, { items: this.analyses });
    if (url === SPOT_CHECKS && method === 'GET') return json(200, { items: this.spotChecks });
    if (url === LIST && method === 'POST') {
      const body = JSON.parse(String(init!.body));
      this.posted.push(body);
      const queued = analysisFixture({ state: 'queued', result: null, request: body, requestedByName: 'Ilse Marrow', createdAt: '2027-03-05T08:00:00.000Z', startedAt: null, finishedAt: null });
      this.analyses = [queued, ...this.analyses];
      return json(202, queued);
    }
    const one = url.match(/^\/api\/v1\/analyses\/([^/]+)$/);
    const found = one && this.analyses.find((a) => a.id === one[1]);
    if (found) return json(200, found);
    return notServed(url);
  }

  update(id: string, change: Partial<Analysis>): void {
    this.analyses = this.analyses.map((a) => (a.id === id ? { ...a, ...change } : a));
  }

  spotCheckGets(): number {
    return this.fetch.mock.calls.filter(([url]) => url === SPOT_CHECKS).length;
  }

  gets(id: string): number {
    return this.fetch.mock.calls.filter(([url]) => url === `${API}/analyses/${id}`).length;
  }
}

let api: AnalysisApiFake;
let host: VueWrapper | undefined;

async function mountAnalysis(roles: Role[] = ['researcher'], path = `/campaigns/${campaign.id}/analysis`) {
  const router = testRouter(
    { path: '/campaigns/:id/analysis', name: 'campaign-analysis', component: CampaignAnalysisView, props: true },
    { path: '/campaigns/:id/archives', name: 'campaign-archives' },
  );
  host = await mountPage(router, path, () => {
    useSessionStore().person = { id: '0a1b2c3d-4e5f-4a6b-8c7d-9e0f1a2b3c4d', name: 'Ilse Marrow', email: 'ilse@example.org', institutionId: null, roles };
  });
  await flushPromises();
  return { wrapper: host.getComponent(CampaignAnalysisView), router };
}

/** Files the page handed over: name and text. */
function captureDownloads() {
  const files: { name: string; blob: Blob }[] = [];
  let last: Blob | null = null;
  vi.spyOn(URL, 'createObjectURL').mockImplementation((b) => ((last = b as Blob), 'blob:analysis'));
  vi.spyOn(URL, 'revokeObjectURL').mockImplementation(() => undefined);
  vi.spyOn(HTMLAnchorElement.prototype, 'click').mockImplementation(function (this: HTMLAnchorElement) {
    if (last) files.push({ name: this.download, blob: last });
  });
  return files;
}

describe('CampaignAnalysisView', { timeout: 20_000 }, () => {
  beforeEach(() => {
    api = new AnalysisApiFake();
    api.analyses = [latest, earlier];
  });

  afterEach(() => {
    host?.unmount();
    host = undefined;
    resetTestPage();
    vi.useRealTimers();
    vi.restoreAllMocks();
  });

  describe('the latest finished analysis', () => {
    it('should say it is a screening analysis, with the model and the data it used', async () => {
      const { wrapper } = await mountAnalysis();
      const model = wrapper.get('[data-testid="analysis-model"]').text();
      expect(wrapper.get('[data-testid="analysis-screening"]').text()).toContain('not a publication-grade study');
      expect(model).toContain('Λ = ξ/L');
      expect(model).toContain('disorder W from 15 to 18, at the energy most points have');
      expect(model).toContain('L = 6, 8, 10, 12 and 16');
      expect(model).toContain('65 points from 1 archive');
      expect(wrapper.get('[data-testid="analysis-orders"]').text()).toMatch(/nr = 2, ni = 0, mr = 1,\s*mi = 0 \(5 parameters\), given by Ilse Marrow/);
      expect(model).toContain('bootstrap, 20 refits');
    });

    it('should give W_c, nu and Lambda_c with their 95 % intervals, and chi², dof and p', async () => {
      const { wrapper } = await mountAnalysis();
      const wc = wrapper.get('[data-testid="parameter-Wc"]').text();
      expect(wc).toMatch(/Wc\s*16\.5\d\d\s*16\.5\d\d to 16\.5\d\d/);
      expect(wrapper.get('[data-testid="parameter-nu"]').text()).toContain('critical exponent');
      expect(wrapper.get('[data-testid="parameter-critical"]').text()).toMatch(/Λc\s*0\.57\d\d/);
      expect(wrapper.find('[data-testid="parameter-y"]').exists()).toBe(false);
      const fit = wrapper.get('[data-testid="analysis-fit"]').text();
      expect(fit).toContain(`Degrees of freedom${latest.result!.dof}`);
      expect(fit).toContain('bootstrap, 20 refits');
    });

    it('should show each chart’s summary and its numbers where nothing can be drawn', async () => {
      const { wrapper } = await mountAnalysis();
      for (const what of ['data', 'collapse', 'beta']) {
        expect(wrapper.find(`[data-testid="chart-${what}"]`).exists()).toBe(false);
        expect(wrapper.get(`[data-testid="no-chart-${what}"]`).text()).toContain('Chart of');
        expect(wrapper.get(`[data-testid="figure-${what}"] details`).attributes('open')).toBeDefined();
      }
      expect(wrapper.findAll('[data-testid="table-points"] tbody tr')).toHaveLength(65);
      expect(wrapper.get('[data-testid="figure-collapse"]').text()).toContain('The fitted scaling function Λ(ψ)');
    });

    it('should mark the reported model in the scan, and list the crossings with their drift', async () => {
      const { wrapper } = await mountAnalysis();
      const marked = wrapper.findAll('[data-testid="table-model-scan"] tbody tr.marked');
      expect(marked).toHaveLength(1);
      expect(marked[0].text()).toContain('reported');
      expect(wrapper.findAll('[data-testid="table-crossings"] tbody tr')).toHaveLength(latest.result!.crossings.length);
      expect(wrapper.get('[data-testid="analysis-drift"]').text()).toContain('The crossing does not move measurably');
      expect(wrapper.find('[data-testid="analysis-warnings"]').exists()).toBe(false);
    });

    it('should say the warnings in words', async () => {
      api.analyses = [{ ...latest, result: { ...latest.result!, warnings: ['No two successive sizes cross in this W range; the transition may lie outside it.'] } }];
      const { wrapper } = await mountAnalysis();
      expect(wrapper.get('[data-testid="analysis-warnings"]').text()).toContain('the transition may lie outside it');
    });
  });

  describe('downloads', () => {
    it('should hand over each table as CSV and JSON, named after the campaign', async () => {
      const files = captureDownloads();
      const { wrapper } = await mountAnalysis();
      await wrapper.get('[data-testid="download-model-scan-csv"]').trigger('click');
      await wrapper.get('[data-testid="download-crossings-json"]').trigger('click');
      expect(files.map((f) => f.name)).toEqual(['localis-critical-disorder-of-the-3d-anderson-model-model-scan.csv', 'localis-critical-disorder-of-the-3d-anderson-model-crossings.json']);
      expect((await files[0].blob.text()).split('\r\n')[0]).toBe('nr,ni,mr,mi,parameters,Wc,nu,critical,y,chi2,dof,p,chosen,note');
      const json = JSON.parse(await files[1].blob.text());
      expect(json).toMatchObject({ analysisId: latest.id, table: 'crossings' });
      expect(json.rows).toHaveLength(latest.result!.crossings.length);
    });

    it('should export a chart as SVG even where the page cannot draw it', async () => {
      const files = captureDownloads();
      const { wrapper } = await mountAnalysis();
      expect(wrapper.get('[data-testid="export-collapse-png"]').attributes('disabled')).toBeDefined();
      await wrapper.get('[data-testid="export-collapse-svg"]').trigger('click');
      await flushPromises();
      await vi.waitFor(() => expect(files).toHaveLength(1));
      expect(files[0].name).toBe('localis-critical-disorder-of-the-3d-anderson-model-collapse.svg');
      expect(files[0].blob.type).toContain('image/svg+xml');
      expect(await files[0].blob.text()).toMatch(/^<svg/);
    });
  });

  describe('earlier analyses', () => {
    it('should list them all and show the one picked', async () => {
      const { wrapper, router } = await mountAnalysis();
      expect(wrapper.get(`[data-testid="analysis-row-${latest.id}"]`).text()).toContain('Shown');
      expect(wrapper.get(`[data-testid="analysis-row-${earlier.id}"]`).text()).toContain('automatically, after a verified archive');
      await wrapper.get(`[data-testid="analysis-show-${earlier.id}"]`).trigger('click');
      await flushPromises();
      expect(router.currentRoute.value.query.analysis).toBe(earlier.id);
      expect(wrapper.get(`[data-testid="analysis-row-${earlier.id}"]`).text()).toContain('Shown');
      expect(wrapper.get('[data-testid="analysis-orders"]').text()).toContain('chosen by the scan');
    });
  });

  describe('a failed analysis', () => {
    it('should say why it failed, in the worker’s words, above the last result', async () => {
      const failed = analysisFixture({ state: 'failed', result: null, error: 'A finite-size scaling fit needs at least three sizes L; the table has 2 (8, 12)', createdAt: '2027-03-04T10:00:00.000Z' });
      api.analyses = [failed, latest];
      const { wrapper } = await mountAnalysis();
      const message = wrapper.get('[data-testid="analysis-failed"]').text();
      expect(message).toContain('failed.');
      expect(message).toContain('needs at least three sizes L; the table has 2 (8, 12).');
      expect(wrapper.find('[data-testid="analysis-parameters"]').exists()).toBe(true);
    });

    it('should say when nothing earlier has a result', async () => {
      api.analyses = [analysisFixture({ state: 'failed', result: null, error: null })];
      const { wrapper } = await mountAnalysis();
      expect(wrapper.get('[data-testid="analysis-failed"]').text()).toContain('stopped without saying why');
      expect(wrapper.get('[data-testid="analysis-failed"]').text()).toContain('Nothing earlier has a result to show');
    });
  });

  describe('before there is anything to analyse', () => {
    it('should send the reader to the archives when no result archive is verified', async () => {
      api.analyses = [];
      api.archives = [archiveFixture({ state: 'checking' })];
      const { wrapper } = await mountAnalysis();
      const empty = wrapper.get('[data-testid="analysis-empty"]');
      expect(empty.text()).toContain('No verified result archive yet');
      expect(empty.get('a').attributes('href')).toBe(`/campaigns/${campaign.id}/archives`);
      expect(wrapper.find('[data-testid="analysis-run-form"]').exists()).toBe(false);
    });

    it('should say the first analysis is on its way when an archive is verified, and offer to run one', async () => {
      api.analyses = [];
      const { wrapper } = await mountAnalysis();
      expect(wrapper.get('[data-testid="analysis-empty"]').text()).toContain('No analysis yet');
      expect(wrapper.find('[data-testid="analysis-run-form"]').exists()).toBe(true);
    });
  });

  describe('running again', () => {
    it('should check the form with the api’s schema before anything is sent', async () => {
      const { wrapper } = await mountAnalysis();
      for (const L of [6, 8, 10]) await wrapper.get(`[data-testid="analysis-size-${L}"]`).find('input').setValue(false);
      await wrapper.get('[data-testid="analysis-bootstrap"]').setValue('12.5');
      await wrapper.get('[data-testid="analysis-run-form"]').trigger('submit');
      await flushPromises();
      const form = wrapper.get('[data-testid="analysis-run-form"]').text();
      expect(form).toContain('A scaling fit needs at least three sizes');
      expect(form).toContain('Bootstrap is a whole number of refits');
      expect(api.posted).toEqual([]);
    });

    it('should post the request, then show its progress every 2 s until the result is there', async () => {
      vi.useFakeTimers({ toFake: ['setInterval', 'clearInterval'] });
      const { wrapper } = await mountAnalysis();
      await wrapper.get('[data-testid="analysis-orders-scan"]').find('input').setValue(true);
      await wrapper.get(`[data-testid="analysis-size-6"]`).find('input').setValue(false);
      await wrapper.get('[data-testid="analysis-bootstrap"]').setValue('200');
      await wrapper.get('[data-testid="analysis-run-form"]').trigger('submit');
      await flushPromises();
      expect(api.posted).toEqual([{ sizes: [8, 10, 12, 16], bootstrap: 200 }]);
      const queued = api.analyses[0];
      expect(wrapper.get('[data-testid="analysis-live"]').text()).toContain('Waiting for the worker');
      expect(document.body.textContent).toContain('Analysis queued');

      api.update(queued.id, { state: 'running', progress: { done: 40, total: 229 } });
      vi.advanceTimersByTime(2000);
      await flushPromises();
      expect(wrapper.get('[data-testid="analysis-progress-words"]').text()).toContain('40 of 229 fits done');
      expect(wrapper.get('[data-testid="analysis-progress-words"]').text()).toContain('17 %');

      api.update(queued.id, { state: 'done', progress: { done: 229, total: 229 }, result: { ...latest.result!, model: { ...latest.result!.model, sizes: [8, 10, 12, 16] } }, finishedAt: '2027-03-05T08:00:30.000Z' });
      vi.advanceTimersByTime(2000);
      await flushPromises();
      expect(wrapper.find('[data-testid="analysis-live"]').exists()).toBe(false);
      expect(wrapper.get(`[data-testid="analysis-row-${queued.id}"]`).text()).toContain('Shown');
      expect(wrapper.get('[data-testid="analysis-model"]').text()).toContain('L = 8, 10, 12 and 16');
      expect(document.body.textContent).toContain('Analysis finished');

      const settled = api.gets(queued.id);
      vi.advanceTimersByTime(10_000);
      await flushPromises();
      expect(api.gets(queued.id)).toBe(settled);
    });

    it('should not offer the form to a reader outside the group and the office', async () => {
      api.campaign = campaignFixture({ ...campaign, can: CAN_NOTHING });
      const { wrapper } = await mountAnalysis(['committee']);
      expect(wrapper.find('[data-testid="analysis-parameters"]').exists()).toBe(true);
      expect(wrapper.find('[data-testid="analysis-run-form"]').exists()).toBe(false);
      expect(wrapper.find('[data-testid="to-run-form"]').exists()).toBe(false);
    });
  });
  describe('reproducibility spot-checks', () => {
    it('should list each archive’s recomputed points with z, the flagged one marked in words, and the command that repeats it', async () => {
      api.spotChecks = [spotCheckFixture()];
      const { wrapper } = await mountAnalysis();
      const section = wrapper.get('[data-testid="spot-checks"]');
      const check = section.get(`[data-testid="spot-check-${api.spotChecks[0].id}"]`);
      expect(section.text()).toContain('Reproducibility spot-checks');
      expect(section.text()).toContain('a point is flagged when |z| > 3');
      expect(check.text()).toContain('w15-18-L6-16.tar.gz');
      expect(check.get(`[data-testid="spot-check-state-${api.spotChecks[0].id}"]`).text()).toBe('Done');
      expect(check.get(`[data-testid="spot-check-summary-${api.spotChecks[0].id}"]`).text()).toBe('2 of 3 points within 3 standard errors; 1 flagged.');
      expect(section.get('[data-testid="spot-checks-summary"]').text()).toContain('Over 1 archive, 2 of 3 points within 3 standard errors; 1 flagged.');

      const id = api.spotChecks[0].id;
      expect([0, 1, 2].map((i) => check.get(`[data-testid="spot-check-z-${id}-${i}"]`).text())).toEqual(['+0.47', '−4.10', '+1.20']);
      expect(check.find(`[data-testid="spot-check-flag-${id}-0"]`).exists()).toBe(false);
      expect(check.get(`[data-testid="spot-check-flag-${id}-1"]`).text()).toBe('Flagged: |z| > 3');
      expect(check.get(`[data-testid="spot-check-flag-${id}-1"]`).find('.pi-exclamation-triangle').exists()).toBe(true);
      expect(check.text()).toContain('0.5734 ± 0.0021');
      expect(check.text()).toContain('0.5751 ± 0.0029');

      const commands = check.findAll('[data-testid="spot-check-command"]').map((c) => c.text());
      expect(commands).toEqual([
        'localis tmm --dim 3 --width 6 --disorder 15 --energy 0 --precision 0.005 --seed 2718281',
        'localis tmm --dim 3 --width 6 --disorder 16.5 --energy 0 --precision 0.005 --seed 2718281',
        'localis tmm --dim 3 --width 6 --disorder 18 --energy 0 --precision 0.005 --seed 2718281',
      ]);
      expect(check.findAll('[data-testid="spot-check-copy"]')).toHaveLength(3);
    });

    it('should copy a point’s command and say so', async () => {
      const writeText = vi.fn().mockResolvedValue(undefined);
      vi.stubGlobal('navigator', { ...navigator, clipboard: { writeText } });
      api.spotChecks = [spotCheckFixture()];
      const { wrapper } = await mountAnalysis();
      await wrapper.findAll('[data-testid="spot-check-copy"]')[1].trigger('click');
      await flushPromises();
      expect(writeText).toHaveBeenCalledExactlyOnceWith('localis tmm --dim 3 --width 6 --disorder 16.5 --energy 0 --precision 0.005 --seed 2718281');
      expect(document.body.textContent).toContain('Command copied');
    });

    it('should say why the kernel cannot check an archive, or why a check failed', async () => {
      api.spotChecks = [
        spotCheckFixture({ id: '1b2c3d4e-5f6a-4b7c-8d9e-0f1a2b3c4d5e', state: 'not-applicable', rows: [], flagged: 0, progress: null, reason: 'the kernel has real hopping (class AI); this campaign is in class AII' }),
        spotCheckFixture({ state: 'failed', rows: [], flagged: 0, reason: null }),
      ];
      const { wrapper } = await mountAnalysis();
      expect(wrapper.get('[data-testid="spot-check-reason-1b2c3d4e-5f6a-4b7c-8d9e-0f1a2b3c4d5e"]').text()).toBe(
        'This archive cannot be spot-checked: the kernel has real hopping (class AI); this campaign is in class AII.',
      );
      expect(wrapper.get(`[data-testid="spot-check-reason-${api.spotChecks[1].id}"]`).text()).toContain('The spot-check failed: the worker stopped without saying why.');
      expect(wrapper.find('[data-testid="spot-checks-summary"]').exists()).toBe(false);
      expect(wrapper.find('[data-testid="download-spot-checks-csv"]').exists()).toBe(false);
    });

    it('should show the section with its empty state even before there is any analysis', async () => {
      api.analyses = [];
      api.archives = [archiveFixture({ state: 'checking' })];
      const { wrapper } = await mountAnalysis();
      expect(wrapper.get('[data-testid="analysis-empty"]').text()).toContain('No verified result archive yet');
      expect(wrapper.get('[data-testid="spot-checks-empty"]').text()).toContain('No verified archives have been spot-checked yet.');
    });

    it('should show a running check’s progress, asked again every 3 s until it is done, then stop asking', async () => {
      vi.useFakeTimers({ toFake: ['setInterval', 'clearInterval'] });
      const done = spotCheckFixture();
      api.spotChecks = [{ ...done, state: 'running', progress: { done: 1, total: 3 }, rows: [], flagged: 0, finishedAt: null }];
      const { wrapper } = await mountAnalysis();
      expect(wrapper.get(`[data-testid="spot-check-state-${done.id}"]`).text()).toBe('Running');
      expect(wrapper.find(`[data-testid="spot-check-progress-${done.id}"]`).exists()).toBe(true);
      expect(wrapper.get('[data-testid="spot-checks"]').text()).toContain('Running: 1 of 3 points recomputed, 33 %.');

      api.spotChecks = [done];
      vi.advanceTimersByTime(3000);
      await flushPromises();
      expect(wrapper.get(`[data-testid="spot-check-state-${done.id}"]`).text()).toBe('Done');
      expect(wrapper.find(`[data-testid="spot-check-progress-${done.id}"]`).exists()).toBe(false);
      expect(wrapper.findAll('[data-testid="spot-check-command"]')).toHaveLength(3);

      const settled = api.spotCheckGets();
      vi.advanceTimersByTime(10_000);
      await flushPromises();
      expect(api.spotCheckGets()).toBe(settled);
    });

    it('should hand over every point as CSV and JSON, named after the campaign', async () => {
      const files = captureDownloads();
      api.spotChecks = [spotCheckFixture()];
      const { wrapper } = await mountAnalysis();
      expect(wrapper.get('[data-testid="download-spot-checks-csv"]').attributes('aria-label')).toBe('Download the spot-checks as CSV');
      await wrapper.get('[data-testid="download-spot-checks-csv"]').trigger('click');
      await wrapper.get('[data-testid="download-spot-checks-json"]').trigger('click');
      expect(files.map((f) => f.name)).toEqual(['localis-critical-disorder-of-the-3d-anderson-model-spot-checks.csv', 'localis-critical-disorder-of-the-3d-anderson-model-spot-checks.json']);
      const lines = (await files[0].blob.text()).trim().split('\r\n');
      expect(lines[0]).toBe('archive,archiveId,L,W,E,reported,reportedErr,recomputed,recomputedErr,z,flagged,dimension,precision,seed,slices,seconds,command');
      expect(lines).toHaveLength(4);
      const json = JSON.parse(await files[1].blob.text());
      expect(json).toMatchObject({ campaignId: campaign.id, table: 'spot-checks', limit: 3 });
      expect(json.rows[1]).toMatchObject({ W: 16.5, z: -4.1, flagged: true });
    });
  });
});
