/**
 * How fast an archive is verified, against `openssl dgst -sha256` and a plain read of the same file.
 * Not a test: run it by hand on an idle machine,
 *
 *   npx tsx shared/src/archives/check/measure-check.ts [--format tar.gz|tar|zip] [--mib 1024] [--level 6] [--store s3] [--keep]
 *   npx tsx shared/src/archives/check/measure-check.ts --archive /tmp/kept.tar [--store s3]   (an archive kept before)
 *
 * It writes an archive of random binary files plus a small lambda table to /tmp (manifest last, so
 * nothing is written twice), times a plain read, openssl and checkArchive (best of three each, the
 * page cache warm for all), prints MB/s and the ratio to the slower of the read and openssl, and
 * deletes the file unless --keep is given. --level is the gzip level for tar.gz (6, as `tar czf`).
 *
 * With --store s3 the archive is also put in an S3 store (s3rver, the development fake, in a child
 * process) and read back the way the worker reads it: the plain read is a whole GetObject, and the
 * check reads through ranged GetObjects.
 */
import { spawn, spawnSync } from 'node:child_process';
import { createHash, randomFillSync } from 'node:crypto';
import { createReadStream, createWriteStream } from 'node:fs';
import { rm } from 'node:fs/promises';
import { Readable, type Writable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { parseArgs } from 'node:util';
import { createGzip } from 'node:zlib';
import { pack as tarPack } from 'tar-stream';
import { GetObjectCommand, S3Client } from '@aws-sdk/client-s3';
import { Upload } from '@aws-sdk/lib-storage';
import { ZipFile } from 'yazl';
import { ARCHIVE_FORMAT_VERSION, formatOfFileName, type ArchiveManifest } from '../archive.schema';
import { FIXTURE_CAMPAIGN_ID, FIXTURE_RUN_IDS, FIXTURE_SPEC, lambdaTable } from './archive-fixtures';
import { localFileSource, READ_CHUNK_BYTES, type ByteSource, type ResultArchiveFormat } from './archive-source';
import { checkArchive } from './check-archive';

const { values } = parseArgs({
  options: {
    format: { type: 'string', default: 'tar.gz' },
    mib: { type: 'string', default: '1024' },
    level: { type: 'string', default: '6' },
    keep: { type: 'boolean', default: false },
    store: { type: 'string', default: 'file' },
    archive: { type: 'string' },
  },
});
const format = (values.archive ? formatOfFileName(values.archive) : values.format) as ResultArchiveFormat;
if (!['tar.gz', 'tar', 'zip'].includes(format)) throw new Error('--format is tar.gz, tar or zip');
const totalMiB = Number(values.mib);
const FILE_MIB = 128;
const path = values.archive ?? `/tmp/localis-measure-${process.pid}.${format}`;

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

/** s3rver in a child process (so that it does not share this event loop), with the archive put in it. */
async function s3Store(file: string, sizeBytes: number) {
  const directory = `/tmp/localis-measure-s3-${process.pid}`;
  const script = `const S3rver = require('s3rver');
    new S3rver({ address: '127.0.0.1', port: 0, silent: true, directory: ${JSON.stringify(directory)}, configureBuckets: [{ name: 'measure' }] })
      .run().then((a) => console.log(JSON.stringify(a)));`;
  const child = spawn(process.execPath, ['-e', script], { cwd: process.cwd(), stdio: ['ignore', 'pipe', 'inherit'] });
  const port = await new Promise<number>((resolve, reject) => {
    child.stdout!.once('data', (line: Buffer) => resolve(JSON.parse(line.toString()).port));
    child.once('exit', (code) => reject(new Error(`s3rver stopped (${code})`)));
  });
  const client = new S3Client({
    region: 'us-east-1',
    endpoint: `http://127.0.0.1:${port}`,
    forcePathStyle: true,
    credentials: { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' },
    requestChecksumCalculation: 'WHEN_REQUIRED',
    responseChecksumValidation: 'WHEN_REQUIRED',
  });
  const key = `archive.${format}`;
  await new Upload({ client, params: { Bucket: 'measure', Key: key, Body: createReadStream(file, { highWaterMark: READ_CHUNK_BYTES }) }, partSize: 64 * 1024 * 1024 }).done();
  const get = async (range?: { start: number; end: number }) => {
    const answer = await client.send(new GetObjectCommand({ Bucket: 'measure', Key: key, Range: range ? `bytes=${range.start}-${range.end - 1}` : undefined }));
    return answer.Body as Readable;
  };
  const source: ByteSource = { format, sizeBytes, open: (range) => (range && range.end <= range.start ? Promise.resolve(Readable.from([])) : get(range)) };
  return {
    source,
    read: async () => {
      for await (const chunk of await get()) void chunk;
    },
    stop: async () => {
      child.kill();
      client.destroy();
      await rm(directory, { recursive: true, force: true });
    },
  };
}

const made = performance.now();
if (!values.archive) await writeArchive();
const local = await localFileSource(path);
const megabytes = local.sizeBytes / 1e6;
console.log(`${path}: ${(local.sizeBytes / 1024 ** 3).toFixed(2)} GiB, ${format}${format === 'tar.gz' ? ` (gzip level ${values.level})` : ''}, written in ${((performance.now() - made) / 1000).toFixed(1)} s`);
const store = values.store === 's3' ? await s3Store(path, local.sizeBytes) : null;
try {
  let opensslHex = '';
  const read = await best(3, async () => {
    if (store) await store.read();
    else for await (const chunk of createReadStream(path, { highWaterMark: READ_CHUNK_BYTES })) void chunk;
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
    const result = await checkArchive(store?.source ?? local, { expected: { sha256: opensslHex, sizeBytes: local.sizeBytes } });
    const used = process.cpuUsage(before);
    cpu = Math.min(cpu, (used.user + used.system) / 1e6);
    problems = result.problems.length ? JSON.stringify(result.problems) : 'none';
  });
  const reference = Math.max(read, openssl);
  const line = (what: string, seconds: number) => `${what.padEnd(24)} ${seconds.toFixed(3)} s  ${(megabytes / seconds).toFixed(0).padStart(5)} MB/s`;
  console.log(line(store ? 'store read (GetObject)' : 'plain read (node)', read));
  console.log(line('openssl dgst -sha256', openssl));
  console.log(`${line(`checkArchive (${store ? 's3' : 'file'})`, check)}  (${cpu.toFixed(2)} s of CPU in this process, all threads)`);
  console.log(`ratio check / slower of read and openssl: ${(check / reference).toFixed(2)} (target ≤ 1.25); problems: ${problems}`);
} finally {
  await store?.stop();
  if (!values.keep && !values.archive) await rm(path, { force: true });
}
