import { spawn, spawnSync } from 'node:child_process';
import { randomFillSync, randomUUID } from 'node:crypto';
import { createReadStream, existsSync, readdirSync, readFileSync } from 'node:fs';
import { mkdir, mkdtemp, readFile, rm, stat, writeFile } from 'node:fs/promises';
import { cpus, loadavg, tmpdir, totalmem } from 'node:os';
import { join } from 'node:path';
import type { Readable } from 'node:stream';
import { DeleteObjectCommand, GetObjectCommand } from '@aws-sdk/client-s3';
import { Upload } from '@aws-sdk/lib-storage';
import { Queue } from 'bullmq';
import { Redis } from 'ioredis';
import { Archive, disorderValues, loadSettings, QUEUES, type DisorderGrid } from '@localis/shared';
import { checkArchive, createS3Client, localFileSource, packArchive } from '@localis/shared/node';
import { createObjectStore, objectKeyOf } from '@localis/api/archives/object-store';
import { GROUPS, PEOPLE } from '@localis/seeds/scenario';
import { CAMPAIGNS } from '../../seeds/src/campaigns-scenario';
import { ROOT } from './profile';

/**
 * `npm run bench:archives`: a result archive's way through the running test-profile stack (api,
 * worker, object-store fake), timed against plain tools on the same machine in the same run:
 *   - upload with the real `localis upload` vs a plain lib-storage `Upload` of the same file;
 *   - the worker's verification vs `openssl dgst -sha256` of the file and a bare GetObject of the
 *     stored object (verification cannot beat reading and hashing the bytes once);
 *   - peak RSS of the CLI and of the worker for a 256 MiB and a 1 GiB archive (flat in the size).
 * Targets are ratios (at most 1.25). It prints figures and says "target met" or "target missed";
 * it exits non-zero only when something broke (a rejected archive, a failed upload, a timeout).
 * CPU seconds of the worker and of the store come from /proc, to show what a time is made of.
 */
const MiB = 1024 ** 2;
const MB = 1e6;
const RAW_FILE_BYTES = 16 * MiB;
const TARGET_RATIO = 1.25;
const VERIFY_TIMEOUT_MS = 15 * 60_000;
const CLI_BIN = join(ROOT, 'services', 'cli', 'bin', 'localis.mjs');
/** Clock ticks per second of /proc/<pid>/stat (USER_HZ, 100 on Linux). */
const CLOCK_TICKS = 100;

const settings = loadSettings(process.env);
const apiUrl = settings.PUBLIC_URL;
const s3 = createS3Client(settings);
/** The store as the worker reads it (the verifier's source opens `store.read`). */
const objectStore = createObjectStore(settings, s3);
const redis = new Redis({ host: settings.REDIS_HOST, port: settings.REDIS_PORT, maxRetriesPerRequest: null });
const verifyQueue = new Queue(QUEUES.verifyArchive, { connection: redis });

/** A granted campaign of the demo scenario, and a member of its group who uploads for it. */
const campaign = CAMPAIGNS.find((c) => c.state === 'granted')!;
const group = GROUPS.find((g) => g.id === campaign.input.groupId)!;
const uploader = PEOPLE.find((p) => group.memberIds.includes(p.id) && !p.roles.includes('pi')) ?? PEOPLE.find((p) => p.id === group.memberIds[0])!;
const spec = campaign.input.spec as { sizes: number[]; disorder: DisorderGrid; energies: number[]; realizations: number };

interface Generated {
  path: string;
  format: 'tar' | 'tar.gz';
  sizeBytes: number;
}

interface Uploaded {
  archiveId: string;
  /** Process start to exit: start-up, create, parts and SHA-256, complete (the store assembles the parts). */
  wallSeconds: number;
  /** Process start to the archive's creation (start-up and the create request). */
  startupSeconds: number;
  /** The CLI's --stats: parts and SHA-256 only. */
  partsSeconds: number;
  /** From the last part to `received` (the api lists the parts; the store assembles them). */
  completeSeconds: number;
  peakRssBytes: number;
  storeCpu: number;
}

interface Verified {
  ms: number;
  maxRssBytes: number;
  attempts: number;
  workerCpu: number;
  storeCpu: number;
}

const fmtRate = (bytes: number, seconds: number) => `${(bytes / MB / seconds).toFixed(1)} MB/s`;
const fmtMiB = (bytes: number) => `${(bytes / MiB).toFixed(0)} MiB`;
const fmtS = (seconds: number) => `${seconds.toFixed(2)} s`;
const verdict = (ratio: number) => (ratio <= TARGET_RATIO ? 'target met' : 'target missed');
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
/** Other work on the machine shows in every figure here: the load averages say how much there was. */
const load = () => loadavg().map((l) => l.toFixed(2)).join(', ');

/** User + system CPU seconds of every live process in a process group (Linux /proc; 0 elsewhere). */
function groupCpuSeconds(pgid: number | null): number {
  if (pgid === null || !existsSync('/proc')) return 0;
  let ticks = 0;
  for (const pid of readdirSync('/proc').filter((n) => /^\d+$/.test(n))) {
    try {
      const line = readFileSync(`/proc/${pid}/stat`, 'utf8');
      // After "pid (comm) ": state, ppid, pgrp, …; utime and stime are fields 14 and 15.
      const fields = line.slice(line.lastIndexOf(')') + 2).split(' ');
      if (Number(fields[2]) === pgid) ticks += Number(fields[11]) + Number(fields[12]);
    } catch {
      // the process ended meanwhile
    }
  }
  return ticks / CLOCK_TICKS;
}

/** The orchestrator starts each child as a process-group leader and writes its pid to DATA_DIR/run. */
function groupOf(name: 'worker' | 'fakes'): number | null {
  try {
    return Number(readFileSync(join(settings.DATA_DIR, 'run', `${name}.pid`), 'utf8'));
  } catch {
    return null;
  }
}
const workerGroup = groupOf('worker');
const storeGroup = groupOf('fakes');
const ownCpuSeconds = () => {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1e6;
};

/** Lambda over the campaign's planned grid: the result table the checker reads and bounds. */
function lambdaTable(): string {
  const lines = ['L,W,E,lambda,lambda_err'];
  for (const L of spec.sizes) {
    for (const W of disorderValues(spec.disorder)) {
      for (const E of spec.energies) {
        const lambda = 0.576 * Math.exp(-((W - 18.3) / 18.3) * Math.pow(L, 1 / 1.4) * 2);
        lines.push(`${L},${W},${E},${lambda.toPrecision(6)},${(lambda * 0.002).toPrecision(3)}`);
      }
    }
  }
  return lines.join('\n') + '\n';
}

/** A folder of random raw files plus the table, packed into one archive; the folder is removed after. */
async function generate(workDir: string, name: string, rawFiles: number, format: Generated['format']): Promise<Generated> {
  const folder = join(workDir, name);
  await mkdir(join(folder, 'results', 'raw'), { recursive: true });
  const block = Buffer.allocUnsafe(RAW_FILE_BYTES);
  for (let i = 0; i < rawFiles; i++) {
    randomFillSync(block);
    await writeFile(join(folder, 'results', 'raw', `realizations-${String(i).padStart(3, '0')}.bin`), block);
  }
  await writeFile(join(folder, 'results', 'lambda.csv'), lambdaTable());
  const path = join(workDir, `${name}.${format}`);
  await packArchive({
    dir: folder,
    out: path,
    format,
    manifest: {
      campaignId: campaign.id,
      runIds: [],
      code: { name: 'rgf-conductance', version: '1.4.0', commit: '5e1d2c3b4a59' },
      machine: campaign.input.machine,
      parameters: { sizes: spec.sizes, disorder: disorderValues(spec.disorder), energies: spec.energies, realizations: spec.realizations, seeds: [] },
      createdAt: new Date().toISOString(),
    },
  });
  await rm(folder, { recursive: true, force: true });
  return { path, format, sizeBytes: (await stat(path)).size };
}

/** The CLI's `--json` answer: `{ archive, sha256, upload, stats: { peakRssBytes, sentBytes, seconds, megabytesPerSecond } }`. */
function readCliAnswer(stdout: string): { archive: Archive; seconds: number; peakRssBytes: number } {
  const json = JSON.parse(stdout) as { archive?: unknown; stats?: { seconds?: number; peakRssBytes?: number } };
  const seconds = json.stats?.seconds;
  const peakRssBytes = json.stats?.peakRssBytes;
  if (!json.archive || typeof seconds !== 'number' || typeof peakRssBytes !== 'number') throw new Error(`the CLI's --stats --json answer lacks the archive, seconds or peak RSS: ${stdout.slice(0, 500)}`);
  return { archive: Archive.parse(json.archive), seconds, peakRssBytes };
}

/**
 * `localis upload <archive> --campaign <id> --no-wait --stats --json`, as a pipeline would run it;
 * --no-wait so that its time and memory are the upload's alone (the bench waits for the check).
 */
async function uploadWithCli(file: Generated, configDir: string): Promise<Uploaded> {
  const env = { ...process.env, LOCALIS_URL: apiUrl, LOCALIS_TOKEN: token, LOCALIS_CONFIG_DIR: configDir };
  const storeCpuBefore = groupCpuSeconds(storeGroup);
  const startedAt = Date.now();
  const started = performance.now();
  const child = spawn(process.execPath, [CLI_BIN, 'upload', file.path, '--campaign', campaign.id, '--no-wait', '--stats', '--json'], { env, stdio: ['ignore', 'pipe', 'pipe'] });
  let stdout = '';
  let stderr = '';
  child.stdout.setEncoding('utf8').on('data', (d: string) => (stdout += d));
  child.stderr.setEncoding('utf8').on('data', (d: string) => (stderr += d));
  const code = await new Promise<number | null>((resolve, reject) => {
    child.on('error', reject);
    child.on('close', resolve);
  });
  const wallSeconds = (performance.now() - started) / 1000;
  if (code !== 0) throw new Error(`localis upload exited ${code}:\n${stderr.trim()}\n${stdout.trim()}`);
  const { archive, seconds, peakRssBytes } = readCliAnswer(stdout);
  const createdAt = Date.parse(archive.createdAt);
  const receivedAt = Date.parse(archive.receivedAt ?? archive.createdAt);
  return {
    archiveId: archive.id,
    wallSeconds,
    startupSeconds: (createdAt - startedAt) / 1000,
    partsSeconds: seconds,
    completeSeconds: (receivedAt - createdAt) / 1000 - seconds,
    peakRssBytes,
    storeCpu: groupCpuSeconds(storeGroup) - storeCpuBefore,
  };
}

async function apiGet(path: string): Promise<unknown> {
  const res = await fetch(`${apiUrl}/api/v1${path}`, { headers: { authorization: `Bearer ${token}`, accept: 'application/json' } });
  if (!res.ok) throw new Error(`GET ${path} answered ${res.status}: ${await res.text()}`);
  return res.json();
}

/** Poll the api until the worker has checked the archive; then its job's own timing from BullMQ. */
async function waitForVerification(archiveId: string): Promise<Verified> {
  const cpuBefore = { worker: groupCpuSeconds(workerGroup), store: groupCpuSeconds(storeGroup) };
  const started = performance.now();
  for (;;) {
    const a = Archive.parse(await apiGet(`/archives/${archiveId}`));
    if (a.state === 'verified') break;
    if (a.state === 'rejected') throw new Error(`the worker rejected archive ${archiveId}: ${a.problems.map((p) => `${p.code}: ${p.message}`).join('; ')}`);
    if (performance.now() - started > VERIFY_TIMEOUT_MS) throw new Error(`archive ${archiveId} is still ${a.state} after ${VERIFY_TIMEOUT_MS / 60_000} minutes`);
    await sleep(200);
  }
  const workerCpu = groupCpuSeconds(workerGroup) - cpuBefore.worker;
  const storeCpu = groupCpuSeconds(storeGroup) - cpuBefore.store;
  for (let i = 0; i < 150; i++) {
    const jobs = await verifyQueue.getJobs(['completed']);
    const job = jobs.find((j) => (j.data as { archiveId?: string }).archiveId === archiveId && j.returnvalue);
    if (job) {
      const value = job.returnvalue as { outcome: string; ms?: number; maxRssBytes?: number };
      if (value.ms === undefined || value.maxRssBytes === undefined) throw new Error(`the verify job of ${archiveId} returned no timing (${JSON.stringify(value)}); is the worker's verify-archive job current?`);
      return { ms: value.ms, maxRssBytes: value.maxRssBytes, attempts: job.attemptsMade, workerCpu, storeCpu };
    }
    await sleep(200);
  }
  throw new Error(`no completed verify job for archive ${archiveId} in the queue`);
}

/** `openssl dgst -sha256`: the floor for reading and hashing the file once. */
function timeOpenssl(path: string): { seconds: number; sha256: string } {
  const started = performance.now();
  const r = spawnSync('openssl', ['dgst', '-sha256', '-r', path], { encoding: 'utf8' });
  const seconds = (performance.now() - started) / 1000;
  if (r.status !== 0) throw new Error(`openssl dgst failed: ${r.stderr}`);
  return { seconds, sha256: r.stdout.split(' ')[0] };
}

interface Timed {
  seconds: number;
  ownCpu: number;
  storeCpu: number;
}

async function timed(work: () => Promise<unknown>): Promise<Timed> {
  const before = { own: ownCpuSeconds(), store: groupCpuSeconds(storeGroup) };
  const started = performance.now();
  await work();
  return { seconds: (performance.now() - started) / 1000, ownCpu: ownCpuSeconds() - before.own, storeCpu: groupCpuSeconds(storeGroup) - before.store };
}

/** GetObject of the stored archive, streamed to nowhere: the floor for reading it from the store. Returns the chunk count. */
async function bareRead(key: string, sizeBytes: number): Promise<number> {
  const out = await s3.send(new GetObjectCommand({ Bucket: settings.S3_BUCKET, Key: key }));
  let bytes = 0;
  let chunks = 0;
  for await (const chunk of out.Body as Readable) {
    bytes += (chunk as Buffer).byteLength;
    chunks++;
  }
  if (bytes !== sizeBytes) throw new Error(`the bare read gave ${bytes} bytes, not ${sizeBytes}`);
  return chunks;
}

/** A plain lib-storage Upload of the same file to the same store, with its defaults; when its last part was stored. */
async function sdkUpload(path: string, key: string, sizeBytes: number): Promise<{ partsSeconds: number }> {
  const started = performance.now();
  let partsSeconds = 0;
  const upload = new Upload({ client: s3, params: { Bucket: settings.S3_BUCKET, Key: key, Body: createReadStream(path) } });
  upload.on('httpUploadProgress', (p) => {
    if (p.loaded === sizeBytes) partsSeconds = (performance.now() - started) / 1000;
  });
  await upload.done();
  return { partsSeconds };
}

/** The checker alone, in this process: on the local file (its own cost), or on the stored object read as the worker reads it. */
async function checkHere(source: 'local' | 'store', file: Generated, key: string): Promise<void> {
  const result = await checkArchive(
    source === 'local' ? await localFileSource(file.path) : { format: file.format, sizeBytes: file.sizeBytes, open: (range?: { start: number; end: number }) => objectStore.read(key, range) },
  );
  if (result.problems.length) throw new Error(`checkArchive found problems in the ${source} copy: ${result.problems.map((p) => p.message).join('; ')}`);
}

function opensslVersion(): string {
  return spawnSync('openssl', ['version'], { encoding: 'utf8' }).stdout?.trim() || 'openssl not found';
}

/** One archive through the stack: generated, uploaded with the CLI, verified by the worker. */
async function throughTheStack(workDir: string, configDir: string, name: string, rawFiles: number, format: Generated['format']) {
  const file = await generate(workDir, name, rawFiles, format);
  const upload = await uploadWithCli(file, configDir);
  storedKeys.push(objectKeyOf(campaign.id, upload.archiveId, format));
  const verified = await waitForVerification(upload.archiveId);
  const label = `${fmtMiB(file.sizeBytes)} .${format}`.padEnd(15);
  console.log(
    `  ${label} upload ${fmtS(upload.wallSeconds)} end to end, ${fmtRate(file.sizeBytes, upload.wallSeconds)} = ${fmtS(upload.startupSeconds)} start-up and create` +
      ` + ${fmtS(upload.partsSeconds)} parts and SHA-256 (--stats, ${fmtRate(file.sizeBytes, upload.partsSeconds)}) + ${fmtS(upload.completeSeconds)} complete (the store assembles the parts)` +
      ` + ${fmtS(upload.wallSeconds - upload.startupSeconds - upload.partsSeconds - upload.completeSeconds)} answer and exit; CLI peak RSS ${fmtMiB(upload.peakRssBytes)}; store CPU ${fmtS(upload.storeCpu)}`,
  );
  console.log(
    `  ${''.padEnd(15)} check  ${fmtS(verified.ms / 1000)} (job time, ${verified.attempts} ${verified.attempts === 1 ? 'attempt' : 'attempts'}), ${fmtRate(file.sizeBytes, verified.ms / 1000)};` +
      ` worker peak RSS so far ${fmtMiB(verified.maxRssBytes)}; CPU meanwhile: worker ${fmtS(verified.workerCpu)}, store ${fmtS(verified.storeCpu)}`,
  );
  return { file, upload, verified };
}

const storedKeys: string[] = [];
let token = '';

/**
 * The demo scenario loads before the benchmark, and the worker then checks, analyses and
 * spot-checks its archives (the kernel keeps a core busy for a while): measuring before that is
 * over would time the benchmark against them. Idle is every queue empty for three seconds running.
 */
async function workerIdle(limitMs = 10 * 60_000): Promise<number> {
  const started = performance.now();
  const queues = [QUEUES.verifyArchive, QUEUES.analyze, QUEUES.spotCheck, QUEUES.invoiceRun, QUEUES.invoiceIssued, QUEUES.mail].map((name) => new Queue(name, { connection: redis }));
  try {
    let quietSince = performance.now();
    while (performance.now() - started < limitMs) {
      const counts = await Promise.all(queues.map((q) => q.getJobCounts('waiting', 'active', 'delayed', 'prioritized')));
      const busy = counts.some((c) => Object.values(c).some((n) => n > 0));
      if (busy) quietSince = performance.now();
      else if (performance.now() - quietSince >= 3000) break;
      await sleep(500);
    }
  } finally {
    await Promise.all(queues.map((q) => q.close()));
  }
  return (performance.now() - started) / 1000;
}

async function main(): Promise<void> {
  const benchStarted = performance.now();
  if (!existsSync(CLI_BIN)) throw new Error(`${CLI_BIN} is missing`);
  const tokens = JSON.parse(await readFile(join(settings.DATA_DIR, 'demo-tokens.json'), 'utf8')) as Record<string, string>;
  token = tokens[uploader.email] ?? '';
  if (!token) throw new Error(`no demo token for ${uploader.email} in ${settings.DATA_DIR}/demo-tokens.json`);

  const workDir = await mkdtemp(join(tmpdir(), 'localis-bench-archives-'));
  const configDir = join(workDir, 'cli-config');
  await mkdir(configDir);
  try {
    const cpu = cpus()[0]?.model.trim() ?? 'unknown CPU';
    console.log(`\nLocalis archive benchmark: ${cpus().length} cores (${cpu}), ${(totalmem() / 1024 ** 3).toFixed(0)} GiB RAM, Node ${process.version}, ${opensslVersion()}`);
    console.log(`Campaign "${campaign.input.title}" (granted), uploaded by ${uploader.name} (a member of its group) with their demo token; object store: the s3rver fake at ${settings.S3_ENDPOINT}.`);
    console.log(`Archives: random raw files of ${fmtMiB(RAW_FILE_BYTES)} + a lambda table + manifest.json, packed with packArchive in ${tmpdir()}.`);
    console.log('The main figures are for .tar (no gunzip in the check). MB = 10^6 bytes; CPU = user + system seconds from /proc.');
    const waited = await workerIdle();
    console.log(`Waited ${waited.toFixed(0)} s for the worker's start-up jobs (the demo archives' checks, analyses and spot-checks, the demo invoices) to finish.`);
    console.log(`Load average at the start (1, 5, 15 min): ${load()}${loadavg()[0] > cpus().length / 2 ? ' (other work is running: the figures will be noisy)' : ''}\n`);

    console.log("through the stack (localis upload --no-wait --stats --json, then the worker's check; its job time and peak RSS from BullMQ):");
    const small = await throughTheStack(workDir, configDir, 'results-256MiB', 256 / 16, 'tar');
    const large = await throughTheStack(workDir, configDir, 'results-1GiB', 1024 / 16, 'tar');

    console.log(`\nside by side, the same ${fmtMiB(large.file.sizeBytes)} .tar (${large.file.sizeBytes.toLocaleString('en')} bytes):`);
    const size = large.file.sizeBytes;
    const key = objectKeyOf(campaign.id, large.upload.archiveId, 'tar');
    const openssl = timeOpenssl(large.file.path);
    const local = await timed(() => checkHere('local', large.file, key));
    let chunks = 0;
    const read = await timed(async () => (chunks = await bareRead(key, size)));
    const fromStore = await timed(() => checkHere('store', large.file, key));
    const sdkKey = `bench/sdk-upload-${randomUUID()}.tar`;
    storedKeys.push(sdkKey);
    let sdkParts = 0;
    const sdk = await timed(async () => (sdkParts = (await sdkUpload(large.file.path, sdkKey, size)).partsSeconds));
    const verifySeconds = large.verified.ms / 1000;
    const cpuOf = (own: string, ownCpu: number, storeCpu: number) => `CPU ${own} ${fmtS(ownCpu)}, store ${fmtS(storeCpu)}`;
    const rows: [string, number, string][] = [
      ['openssl dgst -sha256 of the file', openssl.seconds, ''],
      ['checkArchive of the local file (this process, no store)', local.seconds, `CPU ${fmtS(local.ownCpu)} (two threads)`],
      ['bare GetObject of the stored object, to nowhere', read.seconds, `${cpuOf('reader', read.ownCpu, read.storeCpu)}; ${chunks.toLocaleString('en')} chunks of ${(size / chunks / 1024).toFixed(0)} KiB on average`],
      ['checkArchive of the stored object via GetObject (this process)', fromStore.seconds, cpuOf('checker', fromStore.ownCpu, fromStore.storeCpu)],
      ["worker's verification (job time)", verifySeconds, cpuOf('worker', large.verified.workerCpu, large.verified.storeCpu)],
      ['plain lib-storage Upload, 5 MiB parts, 4 at once (create to complete)', sdk.seconds, `${cpuOf('uploader', sdk.ownCpu, sdk.storeCpu)}; last part at ${fmtS(sdkParts)}`],
      ['localis upload, process start to exit', large.upload.wallSeconds, `store CPU ${fmtS(large.upload.storeCpu)}; parts and SHA-256 ${fmtS(large.upload.partsSeconds)}`],
    ];
    for (const [what, seconds, note] of rows) console.log(`  ${what.padEnd(72)} ${fmtS(seconds).padStart(9)} ${fmtRate(size, seconds).padStart(12)}  ${note}`);
    const declared = Archive.parse(await apiGet(`/archives/${large.upload.archiveId}`)).declaredSha256;
    console.log(`  (openssl's SHA-256 is the one the CLI declared and the worker verified: ${openssl.sha256 === declared ? 'yes' : 'NO'})`);

    const floor = Math.max(read.seconds, openssl.seconds);
    const ratios: [string, number][] = [
      [`verification / max(bare read, openssl) = ${fmtS(verifySeconds)} / ${fmtS(floor)}`, verifySeconds / floor],
      [`CLI upload / plain SDK upload, end to end = ${fmtS(large.upload.wallSeconds)} / ${fmtS(sdk.seconds)}`, large.upload.wallSeconds / sdk.seconds],
      [`CLI peak RSS, 1 GiB / 256 MiB = ${fmtMiB(large.upload.peakRssBytes)} / ${fmtMiB(small.upload.peakRssBytes)}`, large.upload.peakRssBytes / small.upload.peakRssBytes],
      [`worker peak RSS, after 1 GiB / after 256 MiB = ${fmtMiB(large.verified.maxRssBytes)} / ${fmtMiB(small.verified.maxRssBytes)}`, large.verified.maxRssBytes / small.verified.maxRssBytes],
    ];
    console.log(`\nratios (target at most ${TARGET_RATIO} each):`);
    for (const [what, ratio] of ratios) console.log(`  ${what.padEnd(80)} ${ratio.toFixed(2).padStart(6)}  ${verdict(ratio)}`);
    console.log(`  (no target) parts only, CLI --stats / SDK until its last part = ${fmtS(large.upload.partsSeconds)} / ${fmtS(sdkParts)}: ${(large.upload.partsSeconds / sdkParts).toFixed(2)}`);
    console.log(`  (no target) verification / the checker on the local file = ${fmtS(verifySeconds)} / ${fmtS(local.seconds)}: ${(verifySeconds / local.seconds).toFixed(2)}`);
    console.log(`  (no target) the checker on the stored object (this process) / max(bare read, openssl) = ${fmtS(fromStore.seconds)} / ${fmtS(floor)}: ${(fromStore.seconds / floor).toFixed(2)}`);

    console.log('\nfor comparison, compressed (gunzip in the check; no target):');
    await throughTheStack(workDir, configDir, 'results-256MiB-gz', 256 / 16, 'tar.gz');
    console.log(`\nbenchmark took ${fmtS((performance.now() - benchStarted) / 1000)}; load average at the end: ${load()}`);
  } finally {
    await rm(workDir, { recursive: true, force: true });
    // The stored copies are large: leave the test profile's store as it was.
    for (const key of storedKeys) await s3.send(new DeleteObjectCommand({ Bucket: settings.S3_BUCKET, Key: key })).catch(() => undefined);
    console.log(`generated files removed (${workDir}) and ${storedKeys.length} stored objects deleted`);
  }
}

main()
  .then(
    () => 0,
    (e: Error) => {
      console.error(`bench:archives failed: ${e.message}`);
      return 1;
    },
  )
  .then(async (code) => {
    await verifyQueue.close().catch(() => undefined);
    redis.disconnect();
    process.exit(code);
  });
