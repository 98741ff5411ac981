import { randomBytes } from 'node:crypto';
import { getEventListeners } from 'node:events';
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Readable } from 'node:stream';
import { beforeAll, describe, expect, it } from 'vitest';
import type { ArchiveProblemCode } from '../archive.schema';
import { buildArchive, FIXTURE_CAMPAIGN_ID, FIXTURE_RUN_IDS, FIXTURE_SPEC, goodArchive, goodEntries, sha256Hex, zerosTarGz, zerosZip, type FixtureEntry } from './archive-fixtures';
import { bufferSource, localFileSource, type ArchiveSource, type ResultArchiveFormat } from './archive-source';
import { THREAD_HASH_FROM_BYTES } from './archive-inspector';
import { checkArchive, type ArchiveCheckResult, type CheckArchiveOptions } from './check-archive';
import { INLINE_HASH_BELOW_BYTES } from './file-hasher';

const FORMATS: ResultArchiveFormat[] = ['tar.gz', 'tar', 'zip'];
const codes = (result: ArchiveCheckResult): ArchiveProblemCode[] => [...new Set(result.problems.map((p) => p.code))].sort();
const check = (archive: Buffer, format: ResultArchiveFormat, options?: CheckArchiveOptions) => checkArchive(bufferSource(archive, format), options);
/** A valid archive (manifest and table) with more entries that the manifest does not list. */
const withExtra = (format: ResultArchiveFormat, extra: FixtureEntry[]) => buildArchive({ format, entries: [...goodEntries().entries, ...extra] });

const campaign = (overrides: Partial<NonNullable<CheckArchiveOptions['campaign']>> = {}): NonNullable<CheckArchiveOptions['campaign']> => ({
  id: FIXTURE_CAMPAIGN_ID,
  machine: 'cluster-a',
  spec: FIXTURE_SPEC,
  runIds: new Set(FIXTURE_RUN_IDS),
  ...overrides,
});

describe('checkArchive: a good archive', () => {
  it.each(FORMATS)('passes as %s, with the whole-file SHA-256, the manifest and the table summary', async (format) => {
    const good = await goodArchive({ format });
    const progress: number[] = [];
    const result = await check(good.archive, format, {
      expected: { sha256: good.sha256, sizeBytes: good.archive.length },
      campaign: campaign(),
      collectRows: 3,
      onProgress: (read, total) => progress.push(read / total),
    });
    expect(result.problems).toEqual([]);
    expect(result.sha256).toBe(good.sha256);
    expect(result.sizeBytes).toBe(good.archive.length);
    expect(result.manifest).toEqual(good.manifest);
    expect(result.entries).toBe(2);
    expect(result.unpackedBytes).toBe(Buffer.byteLength(JSON.stringify(good.manifest, null, 2)) + Buffer.byteLength(good.tableText));
    expect(result.tables).toEqual([{ path: 'results/lambda.csv', kind: 'lambda', rows: good.rows, sizes: [6, 8, 10], disorderMin: 15, disorderMax: 18, energies: [0] }]);
    expect(result.points).toHaveLength(3);
    expect(result.points[0]).toMatchObject({ kind: 'lambda', L: 6, W: 15, E: 0 });
    expect(progress.at(-1)).toBe(1);
  });

  it.each(FORMATS)('passes as %s with manifest.json after the tables', async (format) => {
    const good = await goodArchive({ format, manifestLast: true });
    const result = await check(good.archive, format, { expected: { sha256: good.sha256 }, campaign: campaign() });
    expect(result.problems).toEqual([]);
    expect(result.manifest).toEqual(good.manifest);
  });

  it.each(['tar', 'zip'] as const)('%s: large entries, hashed on the entry thread (a changed byte found too)', async (format) => {
    const raw = randomBytes(THREAD_HASH_FROM_BYTES + 12345);
    const changed = Buffer.from(raw);
    changed[changed.length >> 1] ^= 1;
    const { entries } = goodEntries({ extraFiles: [{ name: 'raw/a.bin', content: raw }, { name: 'raw/b.bin', content: raw }] });
    const archive = await buildArchive({ format, entries: entries.map((e) => (e.name === 'raw/b.bin' ? { ...e, content: changed } : e)) });
    const result = await check(archive, format);
    expect(result.problems).toEqual([expect.objectContaining({ code: 'file-checksum-mismatch', path: 'raw/b.bin' })]);
  });

  it('accepts "./" names, folders, raw data and logs listed in the manifest', async () => {
    const { entries } = goodEntries({ extraFiles: [{ name: 'raw/run-1.bin', content: Buffer.from([0, 1, 2, 255]) }, { name: 'logs/run-1.log', content: 'ok\n' }] });
    const dotted = entries.map((e) => ({ ...e, name: `./${e.name}` }));
    for (const format of FORMATS) {
      const archive = await buildArchive({ format, entries: [{ name: './', type: 'directory' }, { name: 'raw', type: 'directory' }, ...dotted] });
      const result = await check(archive, format);
      expect(result.problems, format).toEqual([]);
      expect(result.entries, format).toBe(6);
    }
  });
});

describe('checkArchive: refusals, one problem per finding', () => {
  const cases: { name: string; extra: FixtureEntry[]; code: ArchiveProblemCode; count?: number; zip?: false }[] = [
    { name: 'an absolute path', extra: [{ name: '/etc/cron.d/evil', content: 'x' }], code: 'unsafe-path' },
    { name: 'a path climbing out with ..', extra: [{ name: '../outside.txt', content: 'x' }], code: 'unsafe-path' },
    { name: '.. inside a path', extra: [{ name: 'results/../../outside.txt', content: 'x' }], code: 'unsafe-path' },
    { name: 'a drive letter', extra: [{ name: 'C:/Windows/evil.txt', content: 'x' }], code: 'unsafe-path' },
    { name: 'a backslash', extra: [{ name: '..\\outside.txt', content: 'x' }], code: 'unsafe-path' },
    { name: 'two unsafe paths (each reported)', extra: [{ name: '/a', content: 'x' }, { name: '../b', content: 'y' }], code: 'unsafe-path', count: 2 },
    { name: 'a symbolic link', extra: [{ name: 'results/link.csv', type: 'symlink', linkname: '/etc/passwd' }], code: 'link-or-device' },
    { name: 'a hard link', extra: [{ name: 'results/hard.csv', type: 'link', linkname: 'results/lambda.csv' }], code: 'link-or-device', zip: false },
    { name: 'a character device', extra: [{ name: 'dev/null', type: 'character-device' }], code: 'link-or-device', zip: false },
    { name: 'a fifo', extra: [{ name: 'results/pipe', type: 'fifo' }], code: 'link-or-device', zip: false },
    { name: 'a duplicate name (after "./")', extra: [{ name: './results/lambda.csv', content: 'L,W,E,lambda,lambda_err\n6,15,0,9,0\n' }], code: 'duplicate-name' },
    { name: 'a file not in the manifest', extra: [{ name: 'results/extra.log', content: 'hello' }], code: 'file-not-in-manifest' },
  ];
  // Zip has no entry types for hard links, devices or fifos (buildArchive refuses to write them);
  // a device mode in a zip's external attributes is refused all the same (read-zip.ts).
  const zipCases = cases.filter((c) => c.zip !== false);

  it.each(cases)('tar.gz: $name → $code', async ({ extra, code, count }) => {
    const result = await check(await withExtra('tar.gz', extra), 'tar.gz');
    expect(codes(result)).toEqual([code]);
    expect(result.problems).toHaveLength(count ?? 1);
    expect(result.sha256).not.toBeNull(); // a finding, not a limit: the whole archive was read
  });

  it.each(zipCases)('zip: $name → $code', async ({ extra, code, count }) => {
    const result = await check(await withExtra('zip', extra), 'zip');
    expect(codes(result)).toEqual([code]);
    expect(result.problems).toHaveLength(count ?? 1);
  });

  it('the fixture writer will not put devices, fifos or hard links in a zip (zip cannot hold them)', async () => {
    await expect(buildArchive({ format: 'zip', entries: [{ name: 'dev/null', type: 'character-device' }] })).rejects.toThrow(/cannot hold/);
  });

  it.each(['tar.gz', 'zip'] as const)('%s: too many entries stops the reading', async (format) => {
    const extra = Array.from({ length: 5 }, (_, i) => ({ name: `logs/${i}.log`, content: `${i}` }));
    const result = await check(await withExtra(format, extra), format, { limits: { maxEntries: 3 } });
    expect(codes(result)).toEqual(['too-many-entries']);
    expect(result.sha256).toBeNull();
  });

  it('stopping after a large entry (hashed on the thread) leaves nothing pending', async () => {
    const extra = [{ name: 'raw/big.bin', content: randomBytes(THREAD_HASH_FROM_BYTES) }, ...Array.from({ length: 3 }, (_, i) => ({ name: `logs/${i}.log`, content: `${i}` }))];
    const result = await check(await withExtra('tar', extra), 'tar', { limits: { maxEntries: 4 } });
    expect(codes(result)).toEqual(['too-many-entries']);
  });

  it.each(['tar.gz', 'zip'] as const)('%s: more unpacked bytes than the limit stops the reading', async (format) => {
    const result = await check(await withExtra(format, [{ name: 'raw/big.bin', content: Buffer.alloc(5000, 7) }]), format, { limits: { maxUnpackedBytes: 4000 } });
    expect(codes(result)).toEqual(['too-large']);
    expect(result.sha256).toBeNull();
  });

  describe('decompression bombs (200 MiB of zeros, built once)', () => {
    const BOMB_BYTES = 200 * 1024 * 1024;
    let tarGzBomb: Buffer;
    let zipBomb: Buffer;
    beforeAll(async () => {
      [tarGzBomb, zipBomb] = await Promise.all([zerosTarGz(BOMB_BYTES), zerosZip(BOMB_BYTES)]);
    }, 30_000);

    it('tar.gz: refused after a few MiB, without reading (let alone inflating) the rest', async () => {
      // Served in 4 KiB pieces, counting what the checker asks for.
      let served = 0;
      const source: ArchiveSource = {
        format: 'tar.gz',
        sizeBytes: tarGzBomb.length,
        open: async () =>
          Readable.from(
            (function* () {
              for (let at = 0; at < tarGzBomb.length; at += 4096) {
                served += Math.min(4096, tarGzBomb.length - at);
                yield tarGzBomb.subarray(at, at + 4096);
              }
            })(),
          ),
      };
      const result = await checkArchive(source);
      expect(codes(result)).toEqual(['compression-bomb']);
      expect(result.sha256).toBeNull();
      expect(served).toBeLessThan(tarGzBomb.length / 4);
    });

    it('zip: refused from the sizes the central directory declares, before inflating anything', async () => {
      const result = await check(zipBomb, 'zip');
      expect(codes(result)).toEqual(['compression-bomb']);
      expect(result.problems[0].message).toContain('200 MiB');
      expect(result.sha256).toBeNull();
    });
  });

  it('zip: an entry that inflates to more than it declares is unreadable', async () => {
    const zip = await withExtra('zip', [{ name: 'raw/zeros.bin', content: Buffer.alloc(100_000) }]);
    // Declare 1000 bytes in both the local and the central header of the last entry.
    const central = zip.lastIndexOf(Buffer.from([0x50, 0x4b, 0x01, 0x02]));
    const local = zip.readUInt32LE(central + 42);
    zip.writeUInt32LE(1000, central + 24);
    zip.writeUInt32LE(1000, local + 22);
    const result = await check(zip, 'zip');
    expect(codes(result)).toEqual(['unreadable']);
    expect(result.problems[0].message).toMatch(/too many bytes/);
  });

  it.each([
    ['a corrupt deflate stream', async () => corrupt((await goodArchive({ format: 'tar.gz', extraFiles: [{ name: 'raw/a.bin', content: Buffer.alloc(20_000, 3) }] })).archive), 'tar.gz'],
    ['a truncated tar.gz', async () => (await goodArchive({ format: 'tar.gz' })).archive.subarray(0, 300), 'tar.gz'],
    ['something that is not gzip', async () => Buffer.from('PK\u0003\u0004 this is not a gzip stream at all'), 'tar.gz'],
    ['a truncated tar', async () => (await goodArchive({ format: 'tar' })).archive.subarray(0, 1000), 'tar'],
    ['a tar with a damaged header', async () => corruptAt((await goodArchive({ format: 'tar' })).archive, 148), 'tar'],
    ['a zip without its central directory', async () => (await goodArchive({ format: 'zip' })).archive.subarray(0, 200), 'zip'],
  ] as const)('%s is unreadable', async (_name, make, format) => {
    const result = await check(await make(), format);
    expect(codes(result)).toEqual(['unreadable']);
    expect(result.sha256).toBeNull();
  });
});

describe('checkArchive: the manifest', () => {
  it.each(FORMATS)('%s: no manifest.json at the root (one in a folder does not count)', async (format) => {
    const { entries } = goodEntries();
    const moved = entries.map((e) => (e.name === 'manifest.json' ? { ...e, name: 'results/manifest.json' } : e));
    const result = await check(await buildArchive({ format, entries: moved }), format);
    // Without a manifest there is nothing to compare the files with: one problem.
    expect(codes(result)).toEqual(['manifest-missing']);
  });

  it('not JSON', async () => {
    const result = await check((await goodArchive({ editManifest: () => '{ "formatVersion": 1, ' })).archive, 'tar.gz');
    expect(codes(result)).toEqual(['manifest-invalid']);
    expect(result.problems[0].message).toContain('not valid UTF-8 JSON');
    expect(result.manifest).toBeNull();
  });

  it('one problem per schema issue, each with its path', async () => {
    const archive = (
      await goodArchive({
        editManifest: (m) => ({ ...m, campaignId: 'not-a-uuid', parameters: { ...m.parameters, sizes: [6, 8.5] }, code: { ...m.code, commit: 'xyz' } }),
      })
    ).archive;
    const result = await check(archive, 'tar.gz');
    expect(codes(result)).toEqual(['manifest-invalid']);
    const messages = result.problems.map((p) => p.message);
    expect(messages).toHaveLength(3);
    expect(messages).toEqual(
      expect.arrayContaining([
        'manifest.json: campaignId: campaignId must be the campaign id (a UUID)',
        'manifest.json: code.commit: code.commit is a hexadecimal commit id of 7 to 64 digits',
        'manifest.json: parameters.sizes.1: sizes are whole numbers',
      ]),
    );
  });

  it('a manifest larger than the limit', async () => {
    const result = await check((await goodArchive()).archive, 'tar.gz', { limits: { maxManifestBytes: 100 } });
    expect(codes(result)).toEqual(['manifest-invalid']);
    expect(result.problems[0].message).toContain('larger than 100 bytes');
  });

  it.each(['tar.gz', 'zip'] as const)('%s: listed files missing, of another size, or with another hash', async (format) => {
    const archive = (
      await goodArchive({
        format,
        extraFiles: [
          { name: 'raw/a.bin', content: 'aaaa' },
          { name: 'raw/b.bin', content: 'bbbb' },
        ],
        editManifest: (m) => ({
          ...m,
          files: [
            ...m.files.map((f) => (f.path === 'raw/a.bin' ? { ...f, sizeBytes: 5 } : f.path === 'raw/b.bin' ? { ...f, sha256: sha256Hex('cccc') } : f)),
            { path: 'raw/c.bin', sizeBytes: 4, sha256: sha256Hex('cccc') },
          ],
        }),
      })
    ).archive;
    const result = await check(archive, format);
    expect(codes(result)).toEqual(['file-checksum-mismatch', 'file-missing', 'file-size-mismatch']);
    expect(result.problems.find((p) => p.code === 'file-missing')?.path).toBe('raw/c.bin');
  });

  it('a bad table is refused with file, line and column', async () => {
    const archive = (await goodArchive({ tableText: 'L,W,E,lambda,lambda_err\n6,15,0,0.8,0.01\n8,15,0,NaN,0.01\n' })).archive;
    const result = await check(archive, 'tar.gz');
    expect(codes(result)).toEqual(['table-invalid']);
    expect(result.problems[0].message).toBe('results/lambda.csv: line 3, column lambda: "NaN" is not a plain finite number');
  });

  it('an archive without any table', async () => {
    const archive = (await goodArchive({ tablePath: 'results/lambda.txt' })).archive;
    expect(codes(await check(archive, 'tar.gz'))).toEqual(['table-invalid']);
  });
});

describe('checkArchive: the upload and the campaign', () => {
  it('the declared size and SHA-256 must match', async () => {
    const good = await goodArchive();
    const result = await check(good.archive, 'tar.gz', { expected: { sha256: sha256Hex('something else'), sizeBytes: good.archive.length + 1 } });
    expect(codes(result)).toEqual(['checksum-mismatch', 'size-mismatch']);
  });

  it('a store that holds fewer bytes than it says', async () => {
    const good = await goodArchive({ format: 'tar' });
    const source = { ...bufferSource(good.archive, 'tar' as const), sizeBytes: good.archive.length + 512 };
    expect(codes(await checkArchive(source))).toEqual(['size-mismatch']);
  });

  it('another campaign, runs of another campaign, another machine, a grid outside the plan', async () => {
    const good = await goodArchive();
    const narrow = { sizes: [6, 8], disorder: { from: 15, to: 17, step: 0.5 }, energies: [0] };
    const result = await check(good.archive, 'tar.gz', {
      campaign: campaign({ id: '00000000-0000-4000-8000-000000000000', machine: 'cluster-b', spec: narrow, runIds: new Set([FIXTURE_RUN_IDS[0]]) }),
    });
    expect(codes(result)).toEqual(['campaign-mismatch', 'outside-spec', 'run-not-in-campaign']);
    const outside = result.problems.filter((p) => p.code === 'outside-spec').map((p) => p.message);
    expect(outside).toEqual([
      'results/lambda.csv: points outside the campaign\'s plan: 7 rows with L not among the planned sizes 6, 8 (first at line 16: L = 10); 6 rows with W outside 15 ≤ W ≤ 17 (first at line 7: W = 17.5)',
      'manifest.json names machine cluster-a; the campaign\'s allocation is on cluster-b',
      'manifest.json: parameters outside the campaign\'s plan: sizes 10 are not among the planned 6, 8; disorder values 17.5, 18 lie outside 15 ≤ W ≤ 17',
    ]);
    expect(result.problems.filter((p) => p.code === 'run-not-in-campaign')).toHaveLength(1);
  });

  it('grid values within 1e-9 of the plan are inside it', async () => {
    const spec = { sizes: [6], disorder: { values: [16.5] }, energies: [0.1] };
    const archive = (await goodArchive({ spec, tableText: 'L,W,E,lambda,lambda_err\n6,16.500000000001,0.10000000000001,0.6,0.01\n' })).archive;
    expect((await check(archive, 'tar.gz', { campaign: campaign({ spec }) })).problems).toEqual([]);
  });

  it('a PDF handed to the archive checker is the wrong type', async () => {
    const result = await checkArchive(bufferSource(Buffer.from('%PDF-1.7'), 'pdf'));
    expect(codes(result)).toEqual(['wrong-type']);
  });
});

describe('checkArchive: a local file', () => {
  it.each(['tar', 'zip'] as const)('%s larger than the inline limit: the file and its large entry are hashed from the file on threads', async (format) => {
    const dir = await mkdtemp(join(tmpdir(), 'localis-check-'));
    try {
      const good = await goodArchive({ format, extraFiles: [{ name: 'raw/big.bin', content: randomBytes(INLINE_HASH_BELOW_BYTES + 1024) }] });
      const path = join(dir, `results.${format}`);
      await writeFile(path, good.archive);
      const progress: [number, number][] = [];
      const result = await checkArchive(await localFileSource(path), { expected: { sha256: good.sha256 }, onProgress: (read, total) => progress.push([read, total]) });
      expect(result.problems).toEqual([]);
      expect(result.sha256).toBe(good.sha256);
      expect(progress.at(-1)).toEqual([good.archive.length, good.archive.length]);
      // One changed byte inside the large entry (it fills most of the file).
      const changed = Buffer.from(good.archive);
      changed[changed.length >> 1] ^= 1;
      await writeFile(path, changed);
      expect(codes(await checkArchive(await localFileSource(path)))).toEqual(['file-checksum-mismatch']);
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });
});

describe('checkArchive: the store and cancelling', () => {
  const failingSource = (archive: Buffer, format: ResultArchiveFormat): ArchiveSource => {
    const good = bufferSource(archive, format);
    return {
      ...good,
      open: async (range) => {
        // The whole-file pass fails half way, as a dropped connection would.
        if (range) return good.open(range);
        return Readable.from(
          (async function* () {
            yield archive.subarray(0, archive.length >> 1);
            throw new Error('connection reset by the store');
          })(),
        );
      },
    };
  };

  it.each(FORMATS)('%s: an error of the store is thrown (to retry), not reported as an unreadable archive', async (format) => {
    const good = await goodArchive({ format });
    await expect(checkArchive(failingSource(good.archive, format))).rejects.toThrow('connection reset by the store');
  });

  it.each(FORMATS)('%s: a cancelled check rejects with the signal reason', async (format) => {
    const good = await goodArchive({ format });
    const controller = new AbortController();
    controller.abort(new Error('shutting down'));
    await expect(check(good.archive, format, { signal: controller.signal })).rejects.toThrow('shutting down');
  });

  it('one signal shared by many checks keeps no listener behind', async () => {
    const controller = new AbortController();
    for (const format of FORMATS) {
      const good = await goodArchive({ format });
      await check(good.archive, format, { signal: controller.signal });
    }
    expect(getEventListeners(controller.signal, 'abort')).toHaveLength(0);
  });

  it('zip: small reads share cached windows (few ranged reads for many entries)', async () => {
    const extra = Array.from({ length: 60 }, (_, i) => ({ name: `logs/run-${i}.log`, content: `run ${i} done\n` }));
    const { entries } = goodEntries({ extraFiles: extra });
    const archive = await buildArchive({ format: 'zip', entries });
    const inner = bufferSource(archive, 'zip');
    let opens = 0;
    const result = await checkArchive({ ...inner, open: async (range) => (opens++, inner.open(range)) });
    expect(result.problems).toEqual([]);
    expect(result.entries).toBe(62);
    expect(opens).toBeLessThan(5);
  });
});

function corrupt(gz: Buffer): Buffer {
  const copy = Buffer.from(gz);
  for (let i = 40; i < copy.length - 20; i += 7) copy[i] ^= 0x5a;
  return copy;
}

function corruptAt(bytes: Buffer, at: number): Buffer {
  const copy = Buffer.from(bytes);
  copy[at] ^= 0xff;
  return copy;
}

