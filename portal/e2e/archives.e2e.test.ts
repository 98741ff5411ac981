import { randomBytes } from 'node:crypto';
import { copyFileSync, mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import type { Archive, ArchiveUpload, Campaign, Run, RunInput, StoredParts } from '@localis/shared';
import { goodArchive } from '@localis/shared/node';
import type { Page, Request, Route } from 'playwright-core';
import { CAMPAIGNS } from '../../seeds/src/campaigns-scenario';
import { DEFAULT_VIEWPORT, demoPerson, eventually, portalUrl, PUBLIC_URL, screenshot, signIn, useBrowser, callApi } from './browser';

/** A member of the Quantum Transport group, which records runs on its granted campaign. */
const PRIYA = demoPerson('priya.raman@kestrel.example');
const CONDUCTANCE = CAMPAIGNS.find((c) => c.input.title === 'Conductance at the 3D unitary critical point')!;

const MIB = 1024 ** 2;
/** Random, so nothing compresses and every byte has to travel: with the table, four parts of 8 MiB. */
const RAW_BYTES = 28 * MIB;
const PHONE_VIEWPORT = { width: 390, height: 844 };
/** Where the screenshots are copied besides `${DATA_DIR}/screenshots` (to look at them after a local run). */
const SHOTS_COPY_DIR = process.env.ARCHIVES_SHOTS_DIR;

const stamp = () => `${Date.now().toString(36)}-${randomBytes(3).toString('hex')}`;


/** A presigned part upload to the object store (S3 UploadPart: `?partNumber=…&uploadId=…`), wherever the store lives. */
function partNumberOf(request: Request): number | null {
  if (request.method() !== 'PUT') return null;
  const url = new URL(request.url());
  const part = url.searchParams.get('partNumber');
  return part && url.searchParams.has('uploadId') ? Number(part) : null;
}
const isPartUrl = (url: URL) => url.searchParams.has('partNumber') && url.searchParams.has('uploadId');

/** A run of 1 core for 36 s (0.01 core-hours): repeated test runs never use up the demo grant. */
function tinyRun(machine: string, jobId: string): RunInput {
  const start = new Date(Math.floor(Date.now() / 1000) * 1000 - 3_600_000);
  return {
    externalJobId: jobId,
    machine,
    startedAt: start.toISOString(),
    endedAt: new Date(start.getTime() + 36_000).toISOString(),
    cores: 1,
    codeName: 'tmm',
    codeVersion: 'e2e-archives',
    parameters: { sizes: [], disorder: [], energies: [], seeds: [] },
  };
}

/** Screenshots at the desktop width and at a phone's, then back to the desktop. */
async function screenshotsAtBothWidths(page: Page, name: string): Promise<void> {
  for (const [suffix, viewport] of [['desktop', DEFAULT_VIEWPORT], ['phone', PHONE_VIEWPORT]] as const) {
    await page.setViewportSize(viewport);
    const path = await screenshot(page, `${name}-${suffix}`);
    if (SHOTS_COPY_DIR) {
      mkdirSync(SHOTS_COPY_DIR, { recursive: true });
      copyFileSync(path, join(SHOTS_COPY_DIR, `${name}-${suffix}.png`));
    }
  }
  await page.setViewportSize(DEFAULT_VIEWPORT);
}

const toast = (page: Page, summary: string) => page.getByRole('alert').filter({ hasText: summary }).first();

describe('archives', () => {
  const browser = useBrowser();
  let workDir: string | null = null;
  /** An upload the test began and did not finish: cancelled, so no stray "Uploading" row stays on the campaign. */
  let unfinished: { page: Page; archiveId: string } | null = null;

  // Registered after useBrowser's, so it runs before the browser closes.
  afterEach(async () => {
    if (unfinished) await callApi(unfinished.page, 'POST', `/archives/${unfinished.archiveId}/cancel`).catch(() => undefined);
    unfinished = null;
    if (workDir) rmSync(workDir, { recursive: true, force: true });
    workDir = null;
  });

  it(
    'should send only the missing parts, verify the archive and show its lineage when a group member resumes an interrupted upload after a reload',
    { timeout: 240_000 },
    async () => {
      const { page, context, expectFailure } = browser.session;
      const jobId = `e2e-archives-${stamp()}`;
      await signIn(page, PRIYA.email);

      // A run the manifest can name, and the planned grid the archive's table has to lie in.
      const run = await callApi<Run>(page, 'POST', `/campaigns/${CONDUCTANCE.id}/runs`, tinyRun(CONDUCTANCE.input.machine, jobId));
      const campaign = await callApi<Campaign>(page, 'GET', `/campaigns/${CONDUCTANCE.id}`);
      const { sizes, disorder, energies } = campaign.spec;

      workDir = mkdtempSync(join(tmpdir(), 'localis-e2e-archives-'));
      const fileName = `conductance-${stamp()}.tar`;
      const filePath = join(workDir, fileName);
      const built = await goodArchive({
        format: 'tar',
        campaignId: campaign.id,
        runIds: [run.id],
        machine: campaign.machine,
        spec: { sizes, disorder, energies },
        extraFiles: [{ name: 'results/raw/conductance.bin', content: randomBytes(RAW_BYTES) }],
      });
      writeFileSync(filePath, built.archive);
      const { code } = built.manifest;

      await page.goto(portalUrl(`/campaigns/${campaign.id}/archives`));
      await page.getByRole('heading', { level: 1, name: 'Archives' }).waitFor();
      const form = page.getByTestId('archive-upload-form');
      await form.waitFor();

      // The store takes the first part to arrive; the others are held until it is stored, then
      // cut off as a dropped connection would.
      let letThrough: number | null = null;
      let firstStored!: () => void;
      const stored = new Promise<void>((resolve) => (firstStored = resolve));
      const interrupt = async (route: Route) => {
        const part = partNumberOf(route.request());
        if (part === null) return route.continue();
        if (letThrough === null || letThrough === part) {
          letThrough = part;
          await route.continue();
          // The store answers once it holds the whole part.
          await route.request().response();
          firstStored();
          return;
        }
        await stored;
        await route.abort('internetdisconnected').catch(() => undefined); // the page may have given up on it already
      };
      expectFailure(/[?&]uploadId=/);
      await page.route(isPartUrl, interrupt);

      const created = page.waitForResponse((r) => r.request().method() === 'POST' && new URL(r.url()).pathname === `/api/v1/campaigns/${campaign.id}/archives`);
      await form.getByTestId('archive-file').setInputFiles(filePath);
      await form.getByTestId('archive-runs').fill(run.id);
      await form.getByTestId('archive-upload').click();
      const upload = (await (await created).json()) as ArchiveUpload;
      const archiveId = upload.archive.id;
      unfinished = { page, archiveId };
      expect(upload.partCount).toBe(4);
      expect(upload.partSizeBytes).toBe(8 * MIB);

      const progress = page.getByTestId('archive-upload-progress');
      await expect.poll(() => progress.getByTestId('archive-upload-state').textContent(), { timeout: 30_000 }).toContain('Paused');
      expect(await progress.getByTestId('archive-upload-error').textContent()).toContain('The connection dropped');
      expect(await progress.getByTestId('archive-upload-percent').textContent()).not.toBe('0 %');
      expect(letThrough).not.toBeNull();
      const before = await callApi<StoredParts>(page, 'GET', `/archives/${archiveId}/parts`);
      expect(before.parts.map((p) => p.partNumber)).toEqual([letThrough]);
      await screenshotsAtBothWidths(page, 'archives-upload-paused');

      // A real reload: this tab's upload is gone, only localStorage remembers it. The page asks
      // before it goes, since an upload is under way.
      await page.unroute(isPartUrl, interrupt);
      const asked: string[] = [];
      page.on('dialog', (dialog) => {
        asked.push(dialog.type());
        void dialog.accept();
      });
      const sentAfterReload: number[] = [];
      const answersAfterReload: number[] = [];
      page.on('request', (request) => {
        const part = partNumberOf(request);
        if (part !== null) sentAfterReload.push(part);
      });
      page.on('response', (response) => {
        if (partNumberOf(response.request()) !== null) answersAfterReload.push(response.status());
      });
      await page.reload();
      expect(asked).toEqual(['beforeunload']);
      await form.waitFor();
      const row = page.getByTestId('archives-table').locator('tbody tr').filter({ has: page.getByTestId(`archive-file-${archiveId}`) });
      await expect.poll(() => row.getByTestId(`archive-state-${archiveId}`).textContent()).toBe('Uploading');

      await form.getByTestId('archive-file').setInputFiles(filePath);
      const offer = form.getByTestId('archive-resume-offer');
      await offer.waitFor();
      expect(await offer.textContent()).toContain('Resuming sends only the parts the store does not hold yet');
      await screenshotsAtBothWidths(page, 'archives-resume-offer');
      await offer.getByTestId('archive-resume').click();

      await expect.poll(() => progress.getByTestId('archive-upload-state').textContent(), { timeout: 60_000 }).toContain('Uploaded');
      const complete = toast(page, 'Upload complete');
      await complete.waitFor();
      unfinished = null;
      const missing = [1, 2, 3, 4].filter((n) => n !== letThrough);
      expect([...sentAfterReload].sort((a, b) => a - b)).toEqual(missing);
      expect(answersAfterReload).toEqual([200, 200, 200]);

      // The worker checks it; the table asks again every 2 s while it waits.
      const state = row.getByTestId(`archive-state-${archiveId}`);
      const verdict = await eventually(
        'the check of the archive',
        async () => {
          const text = (await state.textContent())?.trim();
          return text === 'Verified' || text === 'Rejected' ? text : undefined;
        },
        60_000,
        500,
      );
      if (verdict === 'Rejected') throw new Error(`the worker rejected the archive: ${await page.getByTestId(`archive-notes-${archiveId}`).textContent()}`);
      const archive = await callApi<Archive>(page, 'GET', `/archives/${archiveId}`);
      expect(archive.state).toBe('verified');
      expect(archive.declaredSha256).toBe(built.sha256);
      expect(archive.sizeBytes).toBe(built.archive.length);
      expect(await row.textContent()).toContain(PRIYA.name);
      // The toast lives 4 s; the pictures show the page under it.
      await complete.waitFor({ state: 'hidden' });
      await screenshotsAtBothWidths(page, 'archives-verified');

      // The lineage: the run behind the archive, the code that made the results, who uploaded it.
      await row.getByTestId(`archive-lineage-${archiveId}`).click();
      const lineage = page.getByTestId('archive-lineage');
      await lineage.getByTestId('lineage-svg').waitFor();
      expect(await lineage.getByRole('heading', { level: 2 }).textContent()).toBe(`Lineage of ${fileName}`);
      await lineage.getByText('The lineage in words').click();
      const sentences = lineage.getByTestId('lineage-sentences');
      await sentences.waitFor();
      const words = (await sentences.textContent()) ?? '';
      expect(words).toContain(`Upload and check of ${fileName} was carried out by ${PRIYA.name}.`);
      expect(words).toContain(`Upload and check of ${fileName} was carried out by ${code.name} ${code.version}.`);
      expect(words).toContain(`was made by Job ${jobId} on ${campaign.machine}.`);
      expect(words).toContain(`Job ${jobId} on ${campaign.machine} was carried out by tmm e2e-archives.`);
      await screenshotsAtBothWidths(page, 'archives-lineage');

      // The whole campaign as PROV-JSON, with this session's cookies.
      const href = await lineage.getByTestId('prov-json-link').getAttribute('href');
      const prov = await context.request.get(new URL(href!, PUBLIC_URL).toString());
      expect(prov.status()).toBe(200);
      expect(prov.headers()['content-type']).toMatch(/^application\/json/);
      const doc = (await prov.json()) as { entity: Record<string, Record<string, unknown>>; agent: Record<string, Record<string, unknown>> };
      expect(doc.entity[`localis:archive/${archiveId}`]).toMatchObject({ 'prov:label': fileName, 'localis:sha256': built.sha256 });
      expect(doc.agent[`localis:person/${PRIYA.id}`]).toMatchObject({ 'prov:label': PRIYA.name });
    },
  );
});
