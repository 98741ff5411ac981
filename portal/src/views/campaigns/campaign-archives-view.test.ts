import type { Archive, Role } from '@localis/shared';
import { flushPromises, type VueWrapper } from '@vue/test-utils';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { useSessionStore } from '../../stores/session.store';
import { jsonResponse as json } from '../../test/fetch-stub';
import { mountPage, resetTestPage } from '../../test/mount-in-app';
import CampaignArchivesView from './campaign-archives-view.vue';
import { cancelAllUploads } from './composables/use-archive-upload';
import { rememberUpload } from './lib/archive-upload-memory';
import { archiveFixture, ArchiveStoreFake, sha256Hex, testBytes } from './test/archive-store-fake';
import { CAN_NOTHING, campaignFixture, testRouter } from './test/campaign-fixture';
import { provenanceEntries, VERIFIED_ARCHIVE_ID } from './test/provenance-fixture';

const campaign = campaignFixture({ state: 'granted', can: { ...CAN_NOTHING, recordRuns: true, uploadResults: true, attachFiles: true, withdrawArchives: true } });
const API = '/api/v1';

const verified = archiveFixture({ id: VERIFIED_ARCHIVE_ID, declaredSha256: 'ab'.repeat(32), createdAt: '2027-03-01T09:00:00.000Z' });
const rejected = archiveFixture({
  id: '8d2e3f4a-5b6c-4d7e-8f9a-0b1c2d3e4f5a',
  fileName: 'wc-sweep-L24.zip',
  format: 'zip',
  state: 'rejected',
  declaredSha256: 'cd'.repeat(32),
  createdAt: '2027-03-03T09:00:00.000Z',
  problems: [
    { code: 'file-checksum-mismatch', message: 'tables/lambda.csv does not match the SHA-256 the manifest gives', path: 'tables/lambda.csv' },
    { code: 'outside-spec', message: 'L = 24 is not among the sizes of the campaign' },
  ],
});
const withdrawn = archiveFixture({
  id: '9e3f4a5b-6c7d-4e8f-9a0b-1c2d3e4f5a6b',
  fileName: 'wc-sweep-old.tar.gz',
  createdAt: '2027-02-20T09:00:00.000Z',
  withdrawnAt: '2027-02-25T10:00:00.000Z',
  withdrawnReason: 'Wrong seeds in the L = 16 runs',
  withdrawnByName: 'Orla Fenn',
});
const scienceCase = archiveFixture({
  id: '0f4a5b6c-7d8e-4f9a-8b1c-2d3e4f5a6b7c',
  kind: 'science-case',
  fileName: 'science-case.pdf',
  format: 'pdf',
  sizeBytes: 2 * 1024 ** 2,
  createdAt: '2027-01-10T09:00:00.000Z',
});

let store: ArchiveStoreFake;
let host: VueWrapper | undefined;

function listRequests(): number {
  return store.fetch.mock.calls.filter(([url, init]) => url === `${API}/campaigns/${campaign.id}/archives` && (init?.method ?? 'GET') === 'GET').length;
}

async function mountArchives(roles: Role[] = ['researcher']) {
  const router = testRouter({ path: '/campaigns/:id/archives', name: 'campaign-archives', component: CampaignArchivesView, props: true });
  host = await mountPage(router, `/campaigns/${campaign.id}/archives`, () => {
    useSessionStore().person = { id: '0a1b2c3d-4e5f-4a6b-8c7d-9e0f1a2b3c4d', name: 'Ilse Marrow', email: 'ilse@example.org', institutionId: null, roles };
  });
  return host.getComponent(CampaignArchivesView);
}

type Page = Awaited<ReturnType<typeof mountArchives>>;

function row(wrapper: Page, archive: Archive) {
  return wrapper.get(`[data-testid="archive-file-${archive.id}"]`).element.closest('tr')!;
}

async function pick(wrapper: Page, file: File): Promise<void> {
  const input = wrapper.get('[data-testid="archive-file"]');
  Object.defineProperty(input.element, 'files', { value: [file], configurable: true });
  await input.trigger('change');
}

function fileOf(bytes: Uint8Array<ArrayBuffer>, name: string, lastModified = 1_700_000_000_000): File {
  return new File([bytes], name, { lastModified });
}

describe('CampaignArchivesView', { timeout: 20_000 }, () => {
  beforeEach(() => {
    localStorage.clear();
    store = new ArchiveStoreFake();
    store.add(verified, rejected, withdrawn, scienceCase);
    store.extra = (url) => {
      if (url === `${API}/campaigns/${campaign.id}`) return json(200, campaign);
      if (url === `${API}/campaigns/${campaign.id}/provenance`) return json(200, { items: provenanceEntries() });
      return null;
    };
    vi.stubGlobal('fetch', store.fetch);
  });

  afterEach(() => {
    cancelAllUploads();
    host?.unmount();
    host = undefined;
    resetTestPage();
    vi.useRealTimers();
    vi.restoreAllMocks();
  });

  describe('the table', () => {
    it('should list the archives newest first with kind, size, state, uploader and a short SHA-256', async () => {
      const wrapper = await mountArchives();
      const rows = wrapper.findAll('[data-testid="archives-table"] tbody tr:not(.p-datatable-row-expansion)');
      expect(rows.map((r) => r.find('.file').text())).toEqual(['wc-sweep-L24.zip', 'wc-sweep-L8-16.tar.gz', 'wc-sweep-old.tar.gz', 'science-case.pdf']);
      const first = row(wrapper, verified).textContent!;
      expect(first).toContain('Result archive');
      expect(first).toContain('3 GiB');
      expect(first).toContain('Verified');
      expect(first).toContain('Ilse Marrow');
      expect(first).toContain('abababababab…');
      expect(row(wrapper, scienceCase).textContent).toContain('Science case (PDF)');
      expect(wrapper.get(`[data-testid="archive-state-${rejected.id}"]`).text()).toBe('Rejected');
      expect(wrapper.text()).toContain('4 archives');
    });

    it('should list what the check found under a rejected archive, in words', async () => {
      const wrapper = await mountArchives();
      const notes = wrapper.get(`[data-testid="archive-notes-${rejected.id}"]`).text();
      expect(notes).toContain('Why the check rejected it');
      expect(notes).toContain('tables/lambda.csv does not match the SHA-256 the manifest gives. In tables/lambda.csv.');
      expect(notes).toContain('L = 24 is not among the sizes of the campaign.');
    });

    it('should strike a withdrawn archive through and say who withdrew it and why', async () => {
      const wrapper = await mountArchives();
      expect(row(wrapper, withdrawn).classList).toContain('withdrawn');
      expect(row(wrapper, verified).classList).not.toContain('withdrawn');
      const notes = wrapper.get(`[data-testid="archive-notes-${withdrawn.id}"]`).text();
      expect(notes).toContain('Withdrawn by Orla Fenn on');
      expect(notes).toContain('Wrong seeds in the L = 16 runs.');
      expect(wrapper.find(`[data-testid="archive-withdraw-${withdrawn.id}"]`).exists()).toBe(false);
    });

    it('should copy the whole SHA-256', async () => {
      const writeText = vi.fn().mockResolvedValue(undefined);
      Object.defineProperty(navigator, 'clipboard', { value: { writeText }, configurable: true });
      const wrapper = await mountArchives();
      await wrapper.get(`[data-testid="archive-file-${verified.id}"]`).element.closest('tr')!.querySelector<HTMLElement>('[data-testid="archive-sha-copy"]')!.click();
      await flushPromises();
      expect(writeText).toHaveBeenCalledWith('ab'.repeat(32));
      expect(document.body.textContent).toContain('SHA-256 copied');
    });
  });

  describe('keeping it live', () => {
    it('should ask again every 2 s while an archive is being checked and stop once all are settled', async () => {
      vi.useFakeTimers({ toFake: ['setInterval', 'clearInterval'] });
      store.add({ ...rejected, state: 'checking', problems: [] });
      const wrapper = await mountArchives();
      expect(wrapper.get(`[data-testid="archive-state-${rejected.id}"]`).text()).toBe('Being checked');
      expect(wrapper.get('[data-testid="archives-live"]').text()).toContain('Updating every 2 seconds');
      const before = listRequests();

      vi.advanceTimersByTime(2000);
      await flushPromises();
      expect(listRequests()).toBe(before + 1);

      store.add(rejected);
      vi.advanceTimersByTime(2000);
      await flushPromises();
      expect(wrapper.get(`[data-testid="archive-state-${rejected.id}"]`).text()).toBe('Rejected');
      expect(wrapper.get('[data-testid="archives-live"]').text()).toBe('');

      const settled = listRequests();
      vi.advanceTimersByTime(10_000);
      await flushPromises();
      expect(listRequests()).toBe(settled);
    });
  });

  describe('uploading', () => {
    it('should check the file against the kind before anything is sent', async () => {
      const wrapper = await mountArchives();
      await wrapper.get('[data-testid="archive-upload-form"]').trigger('submit');
      expect(wrapper.text()).toContain('Choose the file to upload');

      await wrapper.get('[data-testid="archive-kind-science-case"]').find('input').setValue(true);
      await pick(wrapper, fileOf(testBytes(100), 'results.tar.gz'));
      await wrapper.get('[data-testid="archive-upload-form"]').trigger('submit');
      expect(wrapper.text()).toContain('A science case (pdf) is a .pdf file');

      await wrapper.get('[data-testid="archive-kind-results"]').find('input').setValue(true);
      await pick(wrapper, fileOf(testBytes(100), 'results.tar.gz'));
      await wrapper.get('[data-testid="archive-runs"]').setValue('not-a-run');
      await wrapper.get('[data-testid="archive-upload-form"]').trigger('submit');
      expect(wrapper.text()).toContain('Each run id is a UUID');
      expect(store.fetch.mock.calls.some(([, init]) => init?.method === 'POST')).toBe(false);
    });

    it('should send the file in parts, show it done and put the new archive in the table', async () => {
      const wrapper = await mountArchives();
      const bytes = testBytes(4500);
      await pick(wrapper, fileOf(bytes, 'wc-sweep-L20.tar.gz'));
      await wrapper.get('[data-testid="archive-runs"]').setValue('5f0c1a2b-3c4d-4e5f-8a9b-0c1d2e3f4a5b');
      await wrapper.get('[data-testid="archive-upload-form"]').trigger('submit');

      await vi.waitFor(() => expect(wrapper.get('[data-testid="archive-upload-state"]').text()).toContain('Uploaded'));
      const created = store.fetch.mock.calls.find(([url, init]) => url === `${API}/campaigns/${campaign.id}/archives` && init?.method === 'POST');
      expect(JSON.parse(String(created?.[1]?.body))).toEqual({ kind: 'results', fileName: 'wc-sweep-L20.tar.gz', sizeBytes: 4500, runIds: ['5f0c1a2b-3c4d-4e5f-8a9b-0c1d2e3f4a5b'] });
      expect(store.completed[0].sha256).toBe(sha256Hex(bytes));
      await flushPromises();
      const added = wrapper.findAll('[data-testid="archives-table"] tbody tr').find((r) => r.text().includes('wc-sweep-L20.tar.gz'));
      expect(added?.text()).toContain('Received, waiting for its check');
      expect(document.body.textContent).toContain('Upload complete');

      await wrapper.get('[data-testid="archive-upload-another"]').trigger('click');
      expect(wrapper.find('[data-testid="archive-upload-form"]').exists()).toBe(true);
    });

    it('should pause and resume with the buttons and show how far it got', async () => {
      store.holdPuts = true;
      const wrapper = await mountArchives();
      const bytes = testBytes(6000);
      await pick(wrapper, fileOf(bytes, 'wc-sweep-L20.tar.gz'));
      await wrapper.get('[data-testid="archive-upload-form"]').trigger('submit');
      await vi.waitFor(() => expect(store.inFlight).toBe(4));
      expect(wrapper.get('[data-testid="archive-upload-percent"]').text()).toBe('0 %');

      await wrapper.get('[data-testid="archive-upload-pause"]').trigger('click');
      expect(wrapper.get('[data-testid="archive-upload-state"]').text()).toBe('Paused');
      expect(wrapper.get('[data-testid="archive-upload-speed"]').text()).toBe('—');
      store.releasePuts();

      await wrapper.get('[data-testid="archive-upload-resume"]').trigger('click');
      await vi.waitFor(() => expect(wrapper.get('[data-testid="archive-upload-state"]').text()).toContain('Uploaded'));
      expect(store.joined(store.completed[0].id)).toEqual(bytes);
    });

    it('should offer to resume a file picked again after a reload, and send only what is missing', async () => {
      const bytes = testBytes(3500);
      const unfinished = store.unfinished(bytes, { 1: bytes.slice(0, 1000), 2: bytes.slice(1000, 2000) }, 'results', 'wc-sweep-L20.tar.gz');
      rememberUpload({
        archiveId: unfinished.id,
        campaignId: campaign.id,
        kind: 'results',
        fileName: 'wc-sweep-L20.tar.gz',
        sizeBytes: 3500,
        lastModified: 1_700_000_000_000,
        startedAt: '2027-03-04T08:00:00.000Z',
      });
      const wrapper = await mountArchives();
      await pick(wrapper, fileOf(bytes, 'wc-sweep-L20.tar.gz'));
      expect(wrapper.get('[data-testid="archive-resume-offer"]').text()).toContain('You began uploading this file on');

      await wrapper.get('[data-testid="archive-resume"]').trigger('click');
      await vi.waitFor(() => expect(wrapper.get('[data-testid="archive-upload-state"]').text()).toContain('Uploaded'));
      expect(store.puts.map((p) => p.partNumber).sort()).toEqual([3, 4]);
      expect(store.completed).toEqual([{ id: unfinished.id, sha256: sha256Hex(bytes) }]);
    });

    it('should not offer to resume another file of the same name', async () => {
      rememberUpload({ archiveId: 'x', campaignId: campaign.id, kind: 'results', fileName: 'wc.tar.gz', sizeBytes: 3500, lastModified: 1, startedAt: '' });
      const wrapper = await mountArchives();
      await pick(wrapper, fileOf(testBytes(3500), 'wc.tar.gz', 2));
      expect(wrapper.find('[data-testid="archive-resume-offer"]').exists()).toBe(false);
    });

    it('should ask before cancelling and then offer the form again', async () => {
      store.holdPuts = true;
      const wrapper = await mountArchives();
      await pick(wrapper, fileOf(testBytes(3000), 'wc-sweep-L20.tar.gz'));
      await wrapper.get('[data-testid="archive-upload-form"]').trigger('submit');
      await vi.waitFor(() => expect(store.inFlight).toBe(3));

      await wrapper.get('[data-testid="archive-upload-cancel"]').trigger('click');
      await flushPromises();
      expect(document.body.textContent).toContain('Cancel this upload?');
      const accept = [...document.querySelectorAll<HTMLButtonElement>('button')].find((b) => b.textContent?.includes('Cancel upload'))!;
      accept.click();
      await flushPromises();
      expect(wrapper.find('[data-testid="archive-upload-form"]').exists()).toBe(true);
      expect(store.completed).toEqual([]);
      expect(localStorage.getItem('localis:archive-uploads')).toBeNull();
    });
  });

  describe('actions on an archive', () => {
    it('should open the short-lived address the api gives for a download', async () => {
      const clicked: string[] = [];
      vi.spyOn(HTMLAnchorElement.prototype, 'click').mockImplementation(function (this: HTMLAnchorElement) {
        clicked.push(this.href);
      });
      const wrapper = await mountArchives();
      await wrapper.get(`[data-testid="archive-download-${verified.id}"]`).trigger('click');
      await flushPromises();
      expect(clicked).toEqual([`https://store.test/bucket/${verified.id}/file?signature=abc`]);
    });

    it('should withdraw with a reason of at least 10 characters', async () => {
      const wrapper = await mountArchives(['pi']);
      await wrapper.get(`[data-testid="archive-withdraw-${verified.id}"]`).trigger('click');
      await flushPromises();
      expect(document.body.textContent).toContain('Withdraw wc-sweep-L8-16.tar.gz');

      await wrapper.get('[data-testid="withdraw-reason"]').setValue('wrong');
      await wrapper.get('#withdraw-archive-form').trigger('submit');
      await flushPromises();
      expect(document.body.textContent).toContain('Say in at least 10 characters why the archive is withdrawn');
      expect(store.fetch.mock.calls.some(([url]) => url.endsWith('/withdraw'))).toBe(false);

      await wrapper.get('[data-testid="withdraw-reason"]').setValue('The L = 16 runs used the wrong seeds');
      await wrapper.get('#withdraw-archive-form').trigger('submit');
      await flushPromises();
      const sent = store.fetch.mock.calls.find(([url]) => url === `${API}/archives/${verified.id}/withdraw`);
      expect(JSON.parse(String(sent?.[1]?.body))).toEqual({ reason: 'The L = 16 runs used the wrong seeds' });
      expect(row(wrapper, verified).classList).toContain('withdrawn');
      expect(wrapper.get(`[data-testid="archive-notes-${verified.id}"]`).text()).toContain('The L = 16 runs used the wrong seeds.');
    });

    it('should draw the lineage of a verified archive from the provenance log, with the PROV-JSON link', async () => {
      const wrapper = await mountArchives();
      expect(wrapper.find(`[data-testid="archive-lineage-${rejected.id}"]`).exists()).toBe(false);
      await wrapper.get(`[data-testid="archive-lineage-${verified.id}"]`).trigger('click');
      await flushPromises();

      const panel = wrapper.get('[data-testid="archive-lineage"]');
      expect(panel.text()).toContain('Lineage of wc-sweep-L8-16.tar.gz');
      expect(panel.findAll('[data-testid="lineage-node-entity"]')).toHaveLength(4);
      expect(panel.findAll('[data-testid="lineage-node-activity"]')).toHaveLength(3);
      expect(panel.findAll('[data-testid="lineage-node-agent"]')).toHaveLength(3);
      expect(panel.findAll('[data-testid="lineage-edge-wasDerivedFrom"]')).toHaveLength(2);
      expect(panel.get('.node.focus').text()).toContain('wc-sweep-L8-16.tar.gz');
      expect(panel.get('[data-testid="lineage-svg"]').attributes('aria-label')).toContain('10 items and 13 relations');
      expect(panel.get('[data-testid="lineage-sentences"]').text()).toContain('wc-sweep-L8-16.tar.gz was derived from Run L=16, W=16.5.');
      expect(panel.get('[data-testid="prov-json-link"]').attributes('href')).toBe(`${API}/campaigns/${campaign.id}/provenance?format=prov-json`);
      expect(document.activeElement?.id).toBe('lineage-heading');

      await panel.get('[data-testid="lineage-close"]').trigger('click');
      expect(wrapper.find('[data-testid="archive-lineage"]').exists()).toBe(false);
    });

    it('should say so when the archive is not in the log yet', async () => {
      store.extra = (url) => {
        if (url === `${API}/campaigns/${campaign.id}`) return json(200, campaign);
        if (url === `${API}/campaigns/${campaign.id}/provenance`) return json(200, { items: [] });
        return null;
      };
      const wrapper = await mountArchives();
      await wrapper.get(`[data-testid="archive-lineage-${verified.id}"]`).trigger('click');
      await flushPromises();
      expect(wrapper.get('[data-testid="lineage-empty"]').text()).toContain('not in the provenance log yet');
    });
  });

  describe('what a role sees', () => {
    it('should show a committee member the downloads but no upload and no withdrawing', async () => {
      const asCommittee = campaignFixture({ state: 'granted', can: CAN_NOTHING });
      store.extra = (url) => (url === `${API}/campaigns/${campaign.id}` ? json(200, asCommittee) : null);
      const wrapper = await mountArchives(['committee']);
      expect(wrapper.find('[data-testid="archive-upload-panel"]').exists()).toBe(false);
      expect(wrapper.find(`[data-testid="archive-download-${scienceCase.id}"]`).exists()).toBe(true);
      expect(wrapper.find(`[data-testid="archive-download-${verified.id}"]`).exists()).toBe(true);
      expect(wrapper.find('[data-testid^="archive-withdraw-"]').exists()).toBe(false);
    });

    it('should offer withdrawing a PI only once the check has finished', async () => {
      store.add({ ...rejected, state: 'checking', problems: [] });
      const wrapper = await mountArchives(['pi']);
      expect(wrapper.find(`[data-testid="archive-withdraw-${verified.id}"]`).exists()).toBe(true);
      expect(wrapper.find(`[data-testid="archive-withdraw-${rejected.id}"]`).exists()).toBe(false);
    });

    it('should offer attachments, not results, before the campaign is granted', async () => {
      const draft = campaignFixture({ state: 'draft', can: { ...CAN_NOTHING, edit: true, attachFiles: true } });
      store.extra = (url) => (url === `${API}/campaigns/${campaign.id}` ? json(200, draft) : null);
      const wrapper = await mountArchives();
      expect(wrapper.find('[data-testid="archive-kind-results"]').exists()).toBe(false);
      expect(wrapper.find('[data-testid="archive-kind-science-case"]').exists()).toBe(true);
    });
  });
});
