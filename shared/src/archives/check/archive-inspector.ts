import { createHash, type Hash } from 'node:crypto';
import type { ArchiveLimits } from '../archive.schema';
import { isTableName, MANIFEST_NAME, normalizeEntryName, unsafeNameReason } from './entry-names';
import type { FileHasher } from './file-hasher';
import { HashThread } from './hash-thread';
import { FileRangeHasher } from './range-hasher';
import { NumericTableReader, type TablePoint, type TableSummary } from './numeric-table';
import type { ProblemList } from './problem-list';
import type { SpecBounds } from './spec-bounds';

/** What an entry is, in the words of both tar and zip. */
export type EntryKind = 'file' | 'directory' | 'symlink' | 'link' | 'character-device' | 'block-device' | 'fifo' | 'unknown';

const KIND_WORDS: Record<Exclude<EntryKind, 'file' | 'directory'>, string> = {
  symlink: 'a symbolic link',
  link: 'a hard link',
  'character-device': 'a character device',
  'block-device': 'a block device',
  fifo: 'a named pipe (fifo)',
  unknown: 'an entry of an unsupported type',
};

/** Thrown when a limit is hit: the problem is recorded already and reading stops at once. */
export class StopReading extends Error {
  constructor() {
    super('the archive check stopped at a limit');
  }
}

/** The compression ratio is judged only past this much unpacked data: tiny archives compress oddly. */
export const BOMB_CHECK_AFTER_BYTES = 1024 * 1024;
/** Entries this large are hashed on the entry thread; a thread's round trip would cost more for smaller ones. */
export const THREAD_HASH_FROM_BYTES = 4 * 1024 * 1024;

export interface SeenFile {
  sizeBytes: number;
  sha256: string;
}

export interface InspectorOptions {
  limits: ArchiveLimits;
  problems: ProblemList;
  bounds?: SpecBounds;
  collectRows: number;
  /** The archive is this file on this machine: large entries lying in it as they are get hashed from it. */
  localPath?: string;
  /** Hashes of ranges of the stream the whole-file hasher is fed: large entries lying in it as they are get hashed from there. */
  streamRanges?: FileHasher['ranges'];
}

/**
 * The checks every entry goes through, whatever the container: its name, its kind, the limits, and
 * for a regular file its hash, its size, and (for a table) its rows. Tar and zip readers feed it.
 */
export class ArchiveInspector {
  entries = 0;
  unpackedBytes = 0;
  readonly files = new Map<string, SeenFile>();
  /** Names refused for what they are (links, unsafe names, duplicates): not reported again as missing. */
  readonly refused = new Set<string>();
  readonly tables: TableSummary[] = [];
  readonly points: TablePoint[] = [];
  csvFiles = 0;
  manifest: Buffer | 'too-large' | null = null;
  private entryThread: HashThread | null = null;
  private rangeHasher: FileRangeHasher | null = null;
  private readonly digests: Promise<void>[] = [];

  constructor(private readonly options: InspectorOptions) {}

  /** Every entry's SHA-256 in `files` (those hashed on the thread arrive after their entry ends). */
  async settleDigests(): Promise<void> {
    await Promise.all(this.digests);
  }

  /** Stops the entry threads, if any were started. */
  close(): void {
    this.entryThread?.close();
    this.rangeHasher?.close();
  }

  get problems(): ProblemList {
    return this.options.problems;
  }

  /**
   * An entry's header is known: check it, and answer where its bytes go (null: skip them).
   * `fileOffset` is where its bytes lie in the local archive file, when they lie there as they are.
   * Throws StopReading when a limit is passed.
   */
  beginEntry(rawName: string, kind: EntryKind, declaredSize: number, fileOffset?: number): EntrySink | null {
    const { limits, problems } = this.options;
    this.entries++;
    if (this.entries > limits.maxEntries) {
      problems.add('too-many-entries', `the archive has more than ${limits.maxEntries.toLocaleString('en')} entries, the most verification unpacks`);
      throw new StopReading();
    }
    const unsafe = unsafeNameReason(rawName);
    const name = normalizeEntryName(rawName);
    if (unsafe) {
      problems.add('unsafe-path', `"${printable(rawName)}" ${unsafe}`, printable(rawName));
      this.refused.add(name);
      return null;
    }
    if (kind === 'directory') return null;
    if (kind !== 'file') {
      problems.add('link-or-device', `"${printable(rawName)}" is ${KIND_WORDS[kind]}; an archive holds regular files and folders only`, name);
      this.refused.add(name);
      return null;
    }
    if (name === '') {
      problems.add('unsafe-path', `a file entry has no name ("${printable(rawName)}")`);
      return null;
    }
    if (this.files.has(name) || this.refused.has(name)) {
      problems.add('duplicate-name', `"${name}" appears more than once (names are compared without a leading "./")`, name);
      this.refused.add(name);
      return null;
    }
    if (this.unpackedBytes + declaredSize > limits.maxUnpackedBytes) {
      problems.add('too-large', `the archive unpacks to more than ${formatBytes(limits.maxUnpackedBytes)}, the most verification unpacks`);
      throw new StopReading();
    }
    this.unpackedBytes += declaredSize;
    this.files.set(name, { sizeBytes: -1, sha256: '' }); // taken, so a second entry of this name is a duplicate
    return new EntrySink(this, name, declaredSize, fileOffset);
  }

  /** A file accepted by beginEntry but then not read (say, encrypted): neither present nor missing. */
  dropEntry(name: string): void {
    this.files.delete(name);
    this.refused.add(name);
  }

  /** Unpacked bytes against packed bytes: past the limit, inflate no more. */
  checkRatio(unpackedBytes: number, packedBytes: number): void {
    const { maxCompressionRatio } = this.options.limits;
    if (unpackedBytes < BOMB_CHECK_AFTER_BYTES || unpackedBytes <= maxCompressionRatio * Math.max(1, packedBytes)) return;
    this.options.problems.add(
      'compression-bomb',
      `the archive unpacks to more than ${maxCompressionRatio} times its packed size (${formatBytes(unpackedBytes)} from ${formatBytes(packedBytes)} so far); it was not unpacked further`,
    );
    throw new StopReading();
  }

  /** @internal */
  tableReader(name: string): NumericTableReader {
    this.csvFiles++;
    const { limits, problems, bounds, collectRows } = this.options;
    return new NumericTableReader({
      path: name,
      maxRows: limits.maxTableRows,
      problems,
      bounds,
      collect:
        this.points.length < collectRows
          ? (point) => {
              this.points.push(point);
              return this.points.length < collectRows;
            }
          : undefined,
    });
  }

  /** Whether a large entry at this offset of the local file would be hashed from the file. */
  hashesFromFile(declaredSize: number): boolean {
    return this.options.localPath !== undefined && declaredSize >= THREAD_HASH_FROM_BYTES;
  }

  /** @internal The thread for large entries, started at the first one. */
  threadFor(declaredSize: number): HashThread | null {
    if (declaredSize < THREAD_HASH_FROM_BYTES) return null;
    this.entryThread ??= new HashThread();
    return this.entryThread;
  }

  /**
   * @internal The digest of a large entry from the bytes the whole-file hasher keeps, when the entry
   * lies in the stored file as it is (`fileOffset`) and those bytes are still kept; asked for at the
   * entry's start, before its bytes have all gone by.
   */
  streamRangeDigest(declaredSize: number, fileOffset: number | undefined): Promise<string> | null {
    const { streamRanges } = this.options;
    if (!streamRanges || fileOffset === undefined || declaredSize < THREAD_HASH_FROM_BYTES) return null;
    const digest = streamRanges.hash(fileOffset, fileOffset + declaredSize);
    digest?.catch(() => undefined); // awaited when the entry ends, unless the check stopped early
    return digest;
  }

  /** @internal The thread hashing ranges of the local file, when this entry can be hashed so. */
  rangeHasherFor(declaredSize: number, fileOffset: number | undefined): FileRangeHasher | null {
    if (fileOffset === undefined || !this.hashesFromFile(declaredSize)) return null;
    this.rangeHasher ??= new FileRangeHasher(this.options.localPath!);
    return this.rangeHasher;
  }

  /** @internal */
  finishEntry(name: string, seen: SeenFile, digest: Promise<string> | null, table: TableSummary | null, manifest: Buffer | 'too-large' | null): void {
    if (digest) {
      const settled = digest.then((hex) => void (seen.sha256 = hex));
      settled.catch(() => undefined); // awaited by settleDigests, unless the check stopped early
      this.digests.push(settled);
    }
    this.files.set(name, seen);
    if (table) this.tables.push(table);
    if (manifest !== null) this.manifest = manifest;
  }

  get maxEntries(): number {
    return this.options.limits.maxEntries;
  }

  get maxManifestBytes(): number {
    return this.options.limits.maxManifestBytes;
  }
}

/**
 * Where a regular file's bytes go: its hash (inline, on the entry thread, or by its range from the
 * local file or from the whole-file hasher's copy), its size, and the table reader or the manifest buffer.
 */
export class EntrySink {
  private readonly ranges: FileRangeHasher | null;
  private readonly streamDigest: Promise<string> | null;
  private readonly thread: HashThread | null;
  private readonly hash: Hash | null;
  private sizeBytes = 0;
  private readonly table: NumericTableReader | null;
  private manifestParts: Buffer[] | null = null;
  private manifestTooLarge = false;

  constructor(
    private readonly inspector: ArchiveInspector,
    readonly name: string,
    declaredSize: number,
    private readonly fileOffset?: number,
  ) {
    this.ranges = inspector.rangeHasherFor(declaredSize, fileOffset);
    this.streamDigest = this.ranges ? null : inspector.streamRangeDigest(declaredSize, fileOffset);
    this.thread = this.ranges || this.streamDigest ? null : inspector.threadFor(declaredSize);
    this.hash = this.ranges || this.streamDigest || this.thread ? null : createHash('sha256');
    this.table = isTableName(name) ? inspector.tableReader(name) : null;
    if (name === MANIFEST_NAME) {
      if (declaredSize > inspector.maxManifestBytes) this.manifestTooLarge = true;
      else this.manifestParts = [];
    }
  }

  /** Takes the bytes; when a promise comes back, wait for it before writing more. */
  write(chunk: Buffer): Promise<void> | void {
    this.sizeBytes += chunk.byteLength;
    if (this.table) this.table.write(chunk);
    if (this.manifestParts) {
      if (this.sizeBytes > this.inspector.maxManifestBytes) {
        this.manifestParts = null;
        this.manifestTooLarge = true;
      } else {
        this.manifestParts.push(Buffer.from(chunk));
      }
    }
    if (this.thread) return this.thread.update(chunk);
    this.hash?.update(chunk);
  }

  /** False when nothing needs the bytes in this thread: hashed from the file, neither a table nor the manifest. */
  get needsBytes(): boolean {
    return !this.ranges || this.table !== null || this.manifestParts !== null || this.manifestTooLarge;
  }

  /** Ends an entry whose bytes were not read here (see needsBytes); its size is the one its container vouches for. */
  endUnread(sizeBytes: number): void {
    this.sizeBytes = sizeBytes;
    this.end();
  }

  end(): void {
    const manifest = this.manifestTooLarge ? 'too-large' : this.manifestParts ? Buffer.concat(this.manifestParts) : null;
    const seen = { sizeBytes: this.sizeBytes, sha256: this.hash ? this.hash.digest('hex') : '' };
    const digest = this.ranges ? this.ranges.hash(this.fileOffset!, this.fileOffset! + this.sizeBytes) : (this.streamDigest ?? this.thread?.endStream() ?? null);
    this.inspector.finishEntry(this.name, seen, digest, this.table?.end() ?? null, manifest);
  }
}

/** Control characters shown escaped: a name is quoted in messages people read. */
function printable(name: string): string {
  const shown = name.length > 300 ? name.slice(0, 300) + '…' : name;
  return shown.replace(/[\u0000-\u001f\u007f]/g, (c) => `\\u${c.charCodeAt(0).toString(16).padStart(4, '0')}`);
}

export function formatBytes(bytes: number): string {
  const units = ['bytes', 'KiB', 'MiB', 'GiB', 'TiB'];
  let value = bytes;
  let unit = 0;
  while (value >= 1024 && unit < units.length - 1) {
    value /= 1024;
    unit++;
  }
  return unit === 0 ? `${bytes} bytes` : `${Number(value.toPrecision(3))} ${units[unit]}`;
}
