import { DEFAULT_ARCHIVE_LIMITS, TABLE_COLUMNS, type ArchiveLimits, type ArchiveManifest, type ArchiveProblem } from '../archive.schema';
import { ArchiveInspector } from './archive-inspector';
import { isResultArchiveFormat, type ArchiveSource, type ByteSource } from './archive-source';
import { MANIFEST_NAME } from './entry-names';
import { createFileHasher } from './file-hasher';
import { compareWithCampaign, compareWithManifest, parseManifest, type CampaignContext } from './manifest-checks';
import type { TablePoint, TableSummary } from './numeric-table';
import { ProblemList } from './problem-list';
import { readTar } from './read-tar';
import { readZip } from './read-zip';
import { specBounds } from './spec-bounds';

export interface CheckArchiveOptions {
  limits?: Partial<ArchiveLimits>;
  /** What the uploader declared for the whole file. */
  expected?: { sha256?: string; sizeBytes?: number };
  /** The campaign the archive is filed under: its id, machine, planned grid and runs. */
  campaign?: CampaignContext;
  /** Table rows to return for the analysis (default 0). */
  collectRows?: number;
  /** Bytes of the stored file read so far; at most four calls a second, and one at the end. */
  onProgress?: (bytesRead: number, totalBytes: number) => void;
  signal?: AbortSignal;
}

export interface ArchiveCheckResult {
  /** SHA-256 of the whole file; null when reading stopped early. */
  sha256: string | null;
  sizeBytes: number;
  /** The manifest when it was found and valid. */
  manifest: ArchiveManifest | null;
  tables: TableSummary[];
  /** Up to `collectRows` table rows, in archive order. */
  points: TablePoint[];
  entries: number;
  /** Bytes of the regular files unpacked (as their headers declare them). */
  unpackedBytes: number;
  /** Empty when the archive is accepted. */
  problems: ArchiveProblem[];
}

/**
 * Verifies a result archive without writing anything anywhere: the whole file's SHA-256 and size,
 * every entry's name, kind and hash, the limits, the manifest, the tables and (given the campaign)
 * the plan. Problems about the archive are returned; an error of the store or a cancel is thrown.
 */
export async function checkArchive(source: ArchiveSource | ByteSource, options: CheckArchiveOptions = {}): Promise<ArchiveCheckResult> {
  const limits: ArchiveLimits = { ...DEFAULT_ARCHIVE_LIMITS, ...options.limits };
  const problems = new ProblemList();
  const { expected, campaign } = options;
  if (expected?.sizeBytes !== undefined && expected.sizeBytes !== source.sizeBytes) {
    problems.add('size-mismatch', `the stored file has ${source.sizeBytes.toLocaleString('en')} bytes; the upload declared ${expected.sizeBytes.toLocaleString('en')}`);
  }
  const format = source.format;
  if (!isResultArchiveFormat(format)) {
    problems.add('wrong-type', `a result archive is a .tar.gz, .tar or .zip file, not a .${format} file`);
    return { sha256: null, sizeBytes: source.sizeBytes, manifest: null, tables: [], points: [], entries: 0, unpackedBytes: 0, problems: problems.list() };
  }
  const archive = source as ArchiveSource;
  const bounds = campaign ? specBounds(campaign.spec) : undefined;
  // A plain tar's entries lie in the file as they are: a large one is hashed from the whole-file hasher's copy.
  const hasher = createFileHasher(archive, { ranges: format === 'tar' });
  const inspector = new ArchiveInspector({
    limits,
    problems,
    bounds,
    collectRows: Math.max(0, options.collectRows ?? 0),
    localPath: archive.localPath,
    streamRanges: hasher.ranges,
  });
  let sha256: string | null = null;
  let completed: boolean;
  let bytesRead: number;
  try {
    const context = { inspector, hasher, onProgress: options.onProgress, signal: options.signal };
    ({ completed, bytesRead } = format === 'zip' ? await readZip(archive, context) : await readTar(archive, context));
    if (completed) [sha256] = await Promise.all([hasher.digest(), inspector.settleDigests()]);
  } finally {
    hasher.close();
    inspector.close();
  }

  if (completed && bytesRead !== archive.sizeBytes) {
    problems.add('size-mismatch', `${bytesRead.toLocaleString('en')} bytes were read; the store gives the file's size as ${archive.sizeBytes.toLocaleString('en')}`);
  }
  if (sha256 !== null && expected?.sha256 !== undefined && expected.sha256.toLowerCase() !== sha256) {
    problems.add('checksum-mismatch', `the file's SHA-256 is ${sha256}; the upload declared ${expected.sha256}`);
  }

  let manifest: ArchiveManifest | null = null;
  if (inspector.manifest !== null) manifest = parseManifest(inspector.manifest, limits.maxManifestBytes, problems);
  else if (completed) problems.add('manifest-missing', `there is no ${MANIFEST_NAME} at the root of the archive`);
  if (manifest && completed) compareWithManifest(manifest, inspector.files, inspector.refused, problems);
  if (manifest && campaign && bounds) compareWithCampaign(manifest, campaign, bounds, problems);
  if (completed && inspector.csvFiles === 0) {
    const headers = Object.values(TABLE_COLUMNS).map((columns) => columns.join(','));
    problems.add('table-invalid', `the archive holds no result table (a .csv file whose header begins ${headers.join(' or ')})`);
  }

  return {
    sha256,
    sizeBytes: completed ? bytesRead : archive.sizeBytes,
    manifest,
    tables: inspector.tables,
    points: inspector.points,
    entries: inspector.entries,
    unpackedBytes: inspector.unpackedBytes,
    problems: problems.list(),
  };
}
