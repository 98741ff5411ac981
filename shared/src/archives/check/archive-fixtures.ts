import { createHash } from 'node:crypto';
import { once } from 'node:events';
import { crc32, createDeflateRaw, createGzip, deflateRawSync, gzipSync } from 'node:zlib';
import { pack as tarPack } from 'tar-stream';
import { disorderValues, type DisorderGrid } from '../../campaigns/campaign-spec.schema';
import { ARCHIVE_FORMAT_VERSION, type ArchiveManifest } from '../archive.schema';
import type { ResultArchiveFormat } from './archive-source';

/**
 * Archives for tests (here and in the api's): any entry, including the ones the checker must
 * refuse (absolute names, "..", links, devices, duplicates), and a valid archive for a campaign.
 * Zip archives are written by a small writer of our own rather than yazl, which (rightly) refuses
 * unsafe names; a second producer also keeps the checker honest about what real zips contain.
 */

export type FixtureEntryType = 'file' | 'symlink' | 'link' | 'directory' | 'character-device' | 'fifo';

export interface FixtureEntry {
  name: string;
  content?: string | Buffer;
  type?: FixtureEntryType;
  /** Target of a symbolic or hard link. */
  linkname?: string;
}

export interface BuildArchiveOptions {
  format: ResultArchiveFormat;
  entries: FixtureEntry[];
}

/** Zip has no entry types for devices, fifos or hard links: asking for one is a test's mistake. */
export const ZIP_CANNOT_HOLD: readonly FixtureEntryType[] = ['link', 'character-device', 'fifo'];

export async function buildArchive({ format, entries }: BuildArchiveOptions): Promise<Buffer> {
  if (format === 'zip') return buildZip(entries);
  const tar = await buildTar(entries);
  return format === 'tar.gz' ? gzipSync(tar) : tar;
}

async function buildTar(entries: FixtureEntry[]): Promise<Buffer> {
  const pack = tarPack();
  const chunks: Buffer[] = [];
  pack.on('data', (chunk: unknown) => void chunks.push(chunk as Buffer));
  const ended = new Promise<void>((resolve, reject) => {
    pack.on('end', () => resolve());
    pack.on('error', reject);
  });
  const mtime = new Date('2026-01-01T00:00:00Z');
  for (const entry of entries) {
    const type = entry.type ?? 'file';
    if (type === 'file') {
      pack.entry({ name: entry.name, type, mtime }, toBuffer(entry.content));
    } else {
      pack.entry({ name: entry.name, type, mtime, linkname: entry.linkname ?? (type === 'symlink' || type === 'link' ? 'results/target' : undefined), devmajor: 1, devminor: 3 });
    }
  }
  pack.finalize();
  await ended;
  return Buffer.concat(chunks);
}

const ZIP_MODES: Record<'file' | 'directory' | 'symlink', number> = { file: 0o100644, directory: 0o040755, symlink: 0o120777 };

interface ZipPiece {
  name: Buffer;
  mode: number;
  method: 0 | 8;
  crc: number;
  size: number;
  data: Buffer;
}

function buildZip(entries: FixtureEntry[]): Buffer {
  const pieces: ZipPiece[] = entries.map((entry) => {
    const type = entry.type ?? 'file';
    if (ZIP_CANNOT_HOLD.includes(type)) throw new Error(`a zip archive cannot hold a ${type} entry (zip has no such entry type)`);
    const content = type === 'symlink' ? Buffer.from(entry.linkname ?? 'results/target') : toBuffer(entry.content);
    const name = type === 'directory' && !entry.name.endsWith('/') ? `${entry.name}/` : entry.name;
    // Deflated, or stored when deflating does not help (as zip tools do with random data; judged
    // from the first 64 KiB, so that large random test files cost no deflating).
    const probe = content.subarray(0, 64 * 1024);
    const deflated = type === 'file' && content.length > 0 && deflateRawSync(probe).length < probe.length ? deflateRawSync(content) : null;
    const deflate = deflated !== null && deflated.length < content.length;
    return {
      name: Buffer.from(name),
      mode: ZIP_MODES[type as 'file' | 'directory' | 'symlink'],
      method: deflate ? 8 : 0,
      crc: crc32(content),
      size: content.length,
      data: deflate ? deflated : content,
    };
  });
  return zipOf(pieces);
}

/** A zip of the given pieces: local headers and data, central directory, end record (no zip64). */
function zipOf(pieces: ZipPiece[]): Buffer {
  const parts: Buffer[] = [];
  const central: Buffer[] = [];
  let offset = 0;
  const dosTime = 0;
  const dosDate = ((2026 - 1980) << 9) | (1 << 5) | 1;
  for (const piece of pieces) {
    const local = Buffer.alloc(30);
    local.writeUInt32LE(0x04034b50, 0);
    local.writeUInt16LE(20, 4);
    local.writeUInt16LE(0x0800, 6); // names in UTF-8
    local.writeUInt16LE(piece.method, 8);
    local.writeUInt16LE(dosTime, 10);
    local.writeUInt16LE(dosDate, 12);
    local.writeUInt32LE(piece.crc >>> 0, 14);
    local.writeUInt32LE(piece.data.length, 18);
    local.writeUInt32LE(piece.size, 22);
    local.writeUInt16LE(piece.name.length, 26);
    local.writeUInt16LE(0, 28);
    const header = Buffer.alloc(46);
    header.writeUInt32LE(0x02014b50, 0);
    header.writeUInt16LE((3 << 8) | 20, 4); // made by Unix: the mode is in the external attributes
    header.writeUInt16LE(20, 6);
    header.writeUInt16LE(0x0800, 8);
    header.writeUInt16LE(piece.method, 10);
    header.writeUInt16LE(dosTime, 12);
    header.writeUInt16LE(dosDate, 14);
    header.writeUInt32LE(piece.crc >>> 0, 16);
    header.writeUInt32LE(piece.data.length, 20);
    header.writeUInt32LE(piece.size, 24);
    header.writeUInt16LE(piece.name.length, 28);
    header.writeUInt32LE((piece.mode << 16) >>> 0, 38);
    header.writeUInt32LE(offset, 42);
    parts.push(local, piece.name, piece.data);
    central.push(header, piece.name);
    offset += local.length + piece.name.length + piece.data.length;
  }
  const centralBytes = Buffer.concat(central);
  const end = Buffer.alloc(22);
  end.writeUInt32LE(0x06054b50, 0);
  end.writeUInt16LE(pieces.length, 8);
  end.writeUInt16LE(pieces.length, 10);
  end.writeUInt32LE(centralBytes.length, 12);
  end.writeUInt32LE(offset, 16);
  return Buffer.concat([...parts, centralBytes, end]);
}

/** A tar.gz holding one file of `sizeBytes` zeros: a decompression bomb, built without holding the zeros. */
export async function zerosTarGz(sizeBytes: number, name = 'results/raw/zeros.bin'): Promise<Buffer> {
  const pack = tarPack();
  const gzip = createGzip({ level: 1 });
  const out: Buffer[] = [];
  gzip.on('data', (chunk: Buffer) => out.push(chunk));
  const done = once(gzip, 'end');
  pack.on('data', (chunk: unknown) => void gzip.write(chunk as Buffer));
  pack.on('end', () => gzip.end());
  const entry = pack.entry({ name, size: sizeBytes });
  const zeros = Buffer.alloc(1024 * 1024);
  for (let left = sizeBytes; left > 0; left -= zeros.length) {
    if (!entry.write(left >= zeros.length ? zeros : zeros.subarray(0, left))) await once(entry, 'drain');
  }
  entry.end(undefined);
  pack.finalize();
  await done;
  return Buffer.concat(out);
}

/** A zip holding one deflated file of `sizeBytes` zeros (the central directory declares the size honestly). */
export async function zerosZip(sizeBytes: number, name = 'results/raw/zeros.bin'): Promise<Buffer> {
  const deflate = createDeflateRaw({ level: 1 });
  const out: Buffer[] = [];
  deflate.on('data', (chunk: Buffer) => out.push(chunk));
  const done = once(deflate, 'end');
  const zeros = Buffer.alloc(1024 * 1024);
  let crc = 0;
  for (let left = sizeBytes; left > 0; left -= zeros.length) {
    const piece = left >= zeros.length ? zeros : zeros.subarray(0, left);
    crc = crc32(piece, crc);
    if (!deflate.write(piece)) await once(deflate, 'drain');
  }
  deflate.end();
  await done;
  return zipOf([{ name: Buffer.from(name), mode: ZIP_MODES.file, method: 8, crc, size: sizeBytes, data: Buffer.concat(out) }]);
}

export interface GoodArchiveOptions {
  format?: ResultArchiveFormat;
  campaignId?: string;
  runIds?: string[];
  machine?: string;
  spec?: { sizes: number[]; disorder: DisorderGrid; energies: number[] };
  /** Other files (raw data, logs), listed in the manifest. */
  extraFiles?: { name: string; content: string | Buffer }[];
  /** Write manifest.json after the files, as some tools do. */
  manifestLast?: boolean;
  /** Change the manifest before it is written (for bad manifests; a string is written as it is); the files are listed already. */
  editManifest?: (manifest: ArchiveManifest) => unknown;
  /** Write this instead of the generated table. */
  tableText?: string;
  tablePath?: string;
}

export interface GoodArchive {
  archive: Buffer;
  /** SHA-256 of the archive file. */
  sha256: string;
  manifest: ArchiveManifest;
  tableText: string;
  /** Rows in the generated table. */
  rows: number;
}

export const FIXTURE_CAMPAIGN_ID = '3f1c9a52-7d4e-4b8a-9c61-2e5f0a7b8d90';
export const FIXTURE_RUN_IDS = ['a1b2c3d4-0001-4e5f-8a9b-0c1d2e3f4a5b', 'a1b2c3d4-0002-4e5f-8a9b-0c1d2e3f4a5b'];
export const FIXTURE_SPEC = { sizes: [6, 8, 10], disorder: { from: 15, to: 18, step: 0.5 }, energies: [0] };

/** A lambda table over the whole planned grid: Lambda falls through the transition near W = 16.5. */
export function lambdaTable(spec: { sizes: number[]; disorder: DisorderGrid; energies: number[] }): { text: string; rows: number } {
  const lines = ['L,W,E,lambda,lambda_err'];
  for (const L of spec.sizes) {
    for (const W of disorderValues(spec.disorder)) {
      for (const E of spec.energies) {
        const lambda = 0.576 * Math.exp(-((W - 16.5) / 16.5) * Math.pow(L, 1 / 1.57) * 2);
        lines.push(`${L},${W},${E},${lambda.toPrecision(6)},${(lambda * 0.002).toPrecision(3)}`);
      }
    }
  }
  return { text: lines.join('\n') + '\n', rows: lines.length - 1 };
}

/** The entries of a valid result archive (manifest first unless told otherwise), to add bad ones to. */
export function goodEntries(options: GoodArchiveOptions = {}): { entries: FixtureEntry[]; manifest: ArchiveManifest; tableText: string; rows: number } {
  const spec = options.spec ?? FIXTURE_SPEC;
  const generated = lambdaTable(spec);
  const tableText = options.tableText ?? generated.text;
  const files = [{ name: options.tablePath ?? 'results/lambda.csv', content: Buffer.from(tableText) }, ...(options.extraFiles ?? []).map((f) => ({ name: f.name, content: toBuffer(f.content) }))];
  const manifest: ArchiveManifest = {
    formatVersion: ARCHIVE_FORMAT_VERSION,
    campaignId: options.campaignId ?? FIXTURE_CAMPAIGN_ID,
    runIds: options.runIds ?? FIXTURE_RUN_IDS,
    code: { name: 'tmm-anderson', version: '2.3.1', commit: '9f3e2a1c' },
    machine: options.machine ?? 'cluster-a',
    parameters: { sizes: spec.sizes, disorder: disorderValues(spec.disorder), energies: spec.energies, realizations: 200, seeds: [11, 12] },
    files: files.map((f) => ({ path: f.name, sizeBytes: f.content.length, sha256: sha256Hex(f.content) })),
    createdAt: '2026-03-01T12:00:00Z',
  };
  const written = options.editManifest ? options.editManifest(structuredClone(manifest)) : manifest;
  const manifestEntry = { name: 'manifest.json', content: typeof written === 'string' ? written : JSON.stringify(written, null, 2) };
  const entries = options.manifestLast ? [...files, manifestEntry] : [manifestEntry, ...files];
  return { entries, manifest, tableText, rows: generated.rows };
}

/** A valid result archive for a campaign (the fixture campaign unless told otherwise). */
export async function goodArchive(options: GoodArchiveOptions = {}): Promise<GoodArchive> {
  const { entries, manifest, tableText, rows } = goodEntries(options);
  const archive = await buildArchive({ format: options.format ?? 'tar.gz', entries });
  return { archive, sha256: sha256Hex(archive), manifest, tableText, rows };
}

export function sha256Hex(bytes: Uint8Array | string): string {
  return createHash('sha256').update(bytes).digest('hex');
}

function toBuffer(content: string | Buffer | undefined): Buffer {
  return typeof content === 'string' ? Buffer.from(content) : (content ?? Buffer.alloc(0));
}
