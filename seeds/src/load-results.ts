import { createHash } from 'node:crypto';
import { mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { Op } from 'sequelize';
import { partRange, type Settings } from '@localis/shared';
import { packArchive } from '@localis/shared/node';
import type { Services } from '@localis/api/services';
import { ArchiveRow, Campaign, Run } from '@localis/api/db';
import { computeDemoTables, kernelSourceHash, lambdaCsv, type ComputedPoint } from './compute-results';
import { DEMO_ARCHIVES, type DemoArchivePlan } from './results-scenario';
import { personContext, scenarioPerson } from './seed-context';

export interface ResultCounts {
  archives: number;
}

/** The kernel that computed the tables, as the manifests name it. */
const KERNEL_CODE = { name: 'localis-transfer-matrix', version: '1' };

/**
 * The demo's result archives: computed by the kernel (or read from the cache under DATA_DIR),
 * packed with a manifest, and uploaded by a member of the group through the real path — the
 * archive is announced, its parts go to the object store through presigned URLs, and completing
 * it queues the worker's check, after which the worker analyses the campaign and spot-checks the
 * archive. An archive of that name already received or checked is left alone; an upload that
 * stopped half-way is cancelled and sent again.
 */
export async function loadResults(services: Services, settings: Settings, report: ResultCounts, log: (line: string) => void = console.log): Promise<void> {
  const todo: DemoArchivePlan[] = [];
  for (const plan of DEMO_ARCHIVES) {
    const campaign = await Campaign.findByPk(plan.campaignId, { attributes: ['id', 'state', 'title'] });
    if (!campaign || !['granted', 'partly-granted'].includes(campaign.state)) {
      log(`demo scenario: "${campaign?.title ?? plan.campaignId}" is not granted here; its demo archive ${plan.fileName} is left out. Start from an empty database to see it.`);
      continue;
    }
    const existing = await ArchiveRow.findAll({ where: { campaignId: plan.campaignId, fileName: plan.fileName, kind: 'results', state: { [Op.ne]: 'rejected' } } });
    const stalled = existing.filter((a) => a.state === 'uploading');
    for (const a of stalled) await services.archives.cancel(personContext(scenarioPerson(plan.uploaderId)), a.id);
    if (existing.length > stalled.length) continue;
    todo.push(plan);
  }
  if (!todo.length) return;

  const dir = join(settings.DATA_DIR, 'demo-results');
  const tables = await computeDemoTables(todo, dir, log);
  for (const plan of todo) {
    await uploadDemoArchive(services, plan, tables.get(plan.fileName)!, dir);
    report.archives++;
  }
}

async function uploadDemoArchive(services: Services, plan: DemoArchivePlan, points: ComputedPoint[], dir: string): Promise<void> {
  const ctx = personContext(scenarioPerson(plan.uploaderId));
  const runs = await Run.findAll({ where: { campaignId: plan.campaignId, externalJobId: plan.runJobIds }, attributes: ['id', 'machine'] });
  if (runs.length !== plan.runJobIds.length) throw new Error(`the demo archive ${plan.fileName} names jobs ${plan.runJobIds.join(', ')}, not all of which are runs of its campaign`);
  const campaign = (await Campaign.findByPk(plan.campaignId, { attributes: ['machine'] }))!;

  // The folder the group would pack: the table and what the kernel was asked and answered.
  const folder = join(dir, plan.fileName.replace(/\.tar\.gz$/, ''));
  rmSync(folder, { recursive: true, force: true });
  mkdirSync(folder, { recursive: true });
  writeFileSync(join(folder, 'lambda.csv'), lambdaCsv(points));
  writeFileSync(join(folder, 'kernel-runs.json'), JSON.stringify(points.map(({ result, ...input }) => ({ input, result })), null, 2) + '\n');
  const file = join(dir, plan.fileName);
  await packArchive({
    dir: folder,
    out: file,
    format: 'tar.gz',
    manifest: {
      campaignId: plan.campaignId,
      runIds: runs.map((r) => r.id),
      // The demo has no repository of its own to name: the kernel's source hash stands for its commit.
      code: { ...KERNEL_CODE, commit: kernelSourceHash().slice(0, 12) },
      machine: campaign.machine,
      parameters: { sizes: plan.sizes.map((s) => s.L), disorder: plan.disorder, energies: [plan.energy], realizations: 1, seeds: points.map((p) => p.seed) },
      createdAt: new Date().toISOString(),
    },
  });
  rmSync(folder, { recursive: true, force: true });

  const bytes = readFileSync(file);
  const upload = await services.archives.create(ctx, plan.campaignId, { kind: 'results', fileName: plan.fileName, sizeBytes: bytes.byteLength, runIds: runs.map((r) => r.id) });
  const partNumbers = Array.from({ length: upload.partCount }, (_, i) => i + 1);
  const { urls } = await services.archives.partUrls(ctx, upload.archive.id, partNumbers);
  for (const { partNumber, url } of urls) {
    const { start, end } = partRange(partNumber, upload.partSizeBytes, bytes.byteLength);
    const res = await fetch(url, { method: 'PUT', body: bytes.subarray(start, end) });
    if (!res.ok) throw new Error(`the object store refused part ${partNumber} of the demo archive ${plan.fileName}: ${res.status} ${await res.text()}`);
  }
  await services.archives.complete(ctx, upload.archive.id, createHash('sha256').update(bytes).digest('hex'));
}
