/**
 * How fast an archive is verified, against `openssl dgst -sha256` and a plain read of the same file.
 * Not a test: run it by hand on an idle machine,
 *
 *   npx tsx shared/src/archives/check/measure-check.ts [--format tar.gz|tar|zip] [--mib 1024] [--level 1] [--keep]
 *
 * It writes an archive of random binary files plus a small lambda table to /tmp (manifest last, so
 * nothing is written twice), times a plain read, openssl and checkArchive (best of three each, the
 * page cache warm for all), prints MB/s and the ratio to the slower of the read and openssl, and
 * deletes the file unless --keep is given. --level is the gzip level for tar.gz (6, as `tar czf`;
 * random data ends up in stored blocks either way).
 */
import { spawnSync } from 'node:child_process';
import { createHash, randomFillSync } from 'node:crypto';
import { createReadStream, createWriteStream } from 'node:fs';
import { rm } from 'node:fs/promises';
import { Readable, type Writable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { parseArgs } from 'node:util';
import { createGzip } from 'node:zlib';
import { pack as tarPack } from 'tar-stream';
import { ZipFile } from 'yazl';
import { ARCHIVE_FORMAT_VERSION, type ArchiveManifest } from '../archive.schema';
import { FIXTURE_CAMPAIGN_ID, FIXTURE_RUN_IDS, FIXTURE_SPEC, lambdaTable } from './archive-fixtures';
import { localFileSource, READ_CHUNK_BYTES, type ResultArchiveFormat } from './archive-source';
import { checkArchive } from './check-archive';

const { values } = parseArgs({
  options: {
    format: { type: 'string', default: 'tar.gz' },
    mib: { type: 'string', default: '1024' },
    level: { type: 'string', default: '6' },
    keep: { type: 'boolean', default: false },
  },
});
const format = values.format as ResultArchiveFormat;
if (!['tar.gz', 'tar', 'zip'].includes(format)) throw new Error('--format is tar.gz, tar or zip');
const totalMiB = Number(values.mib);
const FILE_MIB = 128;
const path = `/tmp/localis-measure-${process.pid}.${format}`;

/** `mib` MiB of random bytes, made as they are read (and hashed on the way). */
function randomFile(mib: number, hash: ReturnType<typeof createHash>): Readable {
  let left = mib;
  return new Readable({
    highWaterMark: READ_CHUNK_BYTES,
    read() {
      if (left-- <= 0) return void this.push(null);
      const chunk = randomFillSync(Buffer.allocUnsafe(READ_CHUNK_BYTES));
      hash.update(chunk);
      this.push(chunk);
    },
  });
}

async function writeArchive(): Promise<void> {
  const table = Buffer.from(lambdaTable(FIXTURE_SPEC).text);
  const files: ArchiveManifest['files'] = [{ path: 'results/lambda.csv', sizeBytes: table.length, sha256: createHash('sha256').update(table).digest('hex') }];
  const raw: { path: string; mib: number; hash: ReturnType<typeof createHash> }[] = [];
  for (let i = 0, left = totalMiB; left > 0; i++, left -= FILE_MIB) raw.push({ path: `raw/chunk-${String(i).padStart(3, '0')}.bin`, mib: Math.min(FILE_MIB, left), hash: createHash('sha256') });
  const manifest = () =>
    Buffer.from(
      JSON.stringify({
        formatVersion: ARCHIVE_FORMAT_VERSION,
        campaignId: FIXTURE_CAMPAIGN_ID,
        runIds: FIXTURE_RUN_IDS,
        code: { name: 'tmm-anderson', version: '2.3.1', commit: '9f3e2a1c' },
        machine: 'cluster-a',
        parameters: { sizes: FIXTURE_SPEC.sizes, disorder: [15, 15.5, 16, 16.5, 17, 17.5, 18], energies: [0], realizations: 200, seeds: [1] },
        files: [...files, ...raw.map((r) => ({ path: r.path, sizeBytes: r.mib * 1024 * 1024, sha256: r.hash.digest('hex') }))],
      } satisfies ArchiveManifest),
    );
  const out = createWriteStream(path, { highWaterMark: READ_CHUNK_BYTES });
  if (format === 'zip') {
    const zip = new ZipFile();
    zip.addBuffer(table, 'results/lambda.csv');
    for (const r of raw) zip.addReadStreamLazy(r.path, { size: r.mib * 1024 * 1024, compress: false }, (cb) => cb(null, randomFile(r.mib, r.hash)));
    const written = pipeline(zip.outputStream as Readable, out);
    // The manifest goes last; yazl asks for each stream in turn, so the hashes are done by then.
    zip.addReadStreamLazy('manifest.json', (cb) => cb(null, Readable.from([manifest()])));
    zip.end();
    await written;
    return;
  }
  const pack = tarPack();
  const written = format === 'tar.gz' ? pipeline(pack as unknown as Readable, createGzip({ level: Number(values.level) }), out) : pipeline(pack as unknown as Readable, out as Writable);
  pack.entry({ name: 'results/lambda.csv' }, table);
  for (const r of raw) {
    await new Promise<void>((resolve, reject) => {
      const sink = pack.entry({ name: r.path, size: r.mib * 1024 * 1024 }, (error) => (error ? reject(error) : resolve()));
      const input = randomFile(r.mib, r.hash);
      input.on('data', (chunk: Buffer) => {
        if (!sink.write(chunk)) {
          input.pause();
          sink.once('drain', () => input.resume());
        }
      });
      input.on('end', () => sink.end(undefined));
    });
  }
  pack.entry({ name: 'manifest.json' }, manifest());
  pack.finalize();
  await written;
}

async function best(runs: number, work: () => Promise<unknown>): Promise<number> {
  let fastest = Infinity;
  for (let i = 0; i < runs; i++) {
    const start = performance.now();
    await work();
    fastest = Math.min(fastest, (performance.now() - start) / 1000);
  }
  return fastest;
}

const made = performance.now();
await writeArchive();
const source = await localFileSource(path);
const megabytes = source.sizeBytes / 1e6;
console.log(`${path}: ${(source.sizeBytes / 1024 ** 3).toFixed(2)} GiB, ${format}${format === 'tar.gz' ? ` (gzip level ${values.level})` : ''}, written in ${((performance.now() - made) / 1000).toFixed(1)} s`);
try {
  let opensslHex = '';
  const read = await best(3, async () => {
    for await (const chunk of createReadStream(path, { highWaterMark: READ_CHUNK_BYTES })) void chunk;
  });
  const openssl = await best(3, async () => {
    const run = spawnSync('openssl', ['dgst', '-sha256', '-r', path], { encoding: 'utf8' });
    if (run.status !== 0) throw new Error(`openssl failed: ${run.stderr}`);
    opensslHex = run.stdout.slice(0, 64);
  });
  let problems = '';
  let cpu = Infinity;
  const check = await best(3, async () => {
    const before = process.cpuUsage();
    const result = await checkArchive(source, { expected: { sha256: opensslHex, sizeBytes: source.sizeBytes } });
    const used = process.cpuUsage(before);
    cpu = Math.min(cpu, (used.user + used.system) / 1e6);
    problems = result.problems.length ? JSON.stringify(result.problems) : 'none';
  });
  const reference = Math.max(read, openssl);
  const line = (what: string, seconds: number) => `${what.padEnd(22)} ${seconds.toFixed(3)} s  ${(megabytes / seconds).toFixed(0).padStart(5)} MB/s`;
  console.log(line('plain read (node)', read));
  console.log(line('openssl dgst -sha256', openssl));
  console.log(`${line('checkArchive', check)}  (${cpu.toFixed(2)} s of CPU over all threads)`);
  console.log(`ratio check / slower of read and openssl: ${(check / reference).toFixed(2)} (target ≤ 1.25); problems: ${problems}`);
} finally {
  if (!values.keep) await rm(path, { force: true });
}
