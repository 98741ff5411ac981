import { z } from 'zod';
import { MachineName } from '../rounds/round.schema';

/**
 * Result archives: the contract between the portal, the CLI, the api and the worker. The archive
 * format itself (manifest.json at the root plus CSV tables) is specified in docs/archive-format.md.
 */

export const ARCHIVE_FORMAT_VERSION = 1;

const Sha256Hex = z.string().regex(/^[0-9a-f]{64}$/, 'a SHA-256 is 64 lower-case hexadecimal digits');
export { Sha256Hex };

/** A path inside an archive, as the manifest names it: relative, forward slashes, no `.` or `..` parts. */
export const ArchivePath = z
  .string()
  .min(1, 'a file path is empty')
  .max(1024, 'a file path may have at most 1024 characters')
  .refine((p) => !p.startsWith('/') && !/^[A-Za-z]:/.test(p), 'paths in the manifest are relative to the archive root')
  .refine((p) => !p.includes('\\'), 'paths use forward slashes')
  .refine((p) => p.split('/').every((part) => part !== '' && part !== '.' && part !== '..'), 'paths may not contain empty, "." or ".." parts');

/** The two result tables the analysis reads; extra columns are allowed after these. */
export const TABLE_KINDS = ['lambda', 'g'] as const;
export type TableKind = (typeof TABLE_KINDS)[number];
export const TABLE_COLUMNS: Record<TableKind, readonly string[]> = {
  lambda: ['L', 'W', 'E', 'lambda', 'lambda_err'],
  g: ['L', 'W', 'E', 'g', 'g_err'],
};

export const ManifestFile = z
  .object({
    path: ArchivePath,
    sizeBytes: z.number().int('sizeBytes is a whole number of bytes').min(0, 'sizeBytes is not negative'),
    sha256: Sha256Hex,
  })
  .strict();
export type ManifestFile = z.infer<typeof ManifestFile>;

const finiteNumbers = (what: string) => z.array(z.number({ message: `${what} are numbers` }).refine(Number.isFinite, `${what} must be finite`)).max(100_000);

export const ArchiveManifest = z
  .object({
    formatVersion: z.literal(ARCHIVE_FORMAT_VERSION, { message: `formatVersion must be ${ARCHIVE_FORMAT_VERSION}` }),
    campaignId: z.uuid('campaignId must be the campaign id (a UUID)'),
    runIds: z.array(z.uuid('each run id is a UUID')).max(100_000),
    code: z
      .object({
        name: z.string().trim().min(1, 'code.name is required').max(200),
        version: z.string().trim().min(1, 'code.version is required').max(100),
        commit: z.string().regex(/^[0-9a-f]{7,64}$/, 'code.commit is a hexadecimal commit id of 7 to 64 digits'),
      })
      .strict(),
    machine: MachineName,
    parameters: z
      .object({
        sizes: z.array(z.number().int('sizes are whole numbers').min(1, 'sizes are at least 1')).min(1, 'list the sizes L covered').max(1000),
        disorder: finiteNumbers('disorder values').min(1, 'list the disorder values W covered'),
        energies: finiteNumbers('energies').min(1, 'list the energies E covered'),
        realizations: z.number().int('realizations is a whole number').min(1, 'at least 1 realization'),
        seeds: z.array(z.number().int('seeds are whole numbers').min(0, 'seeds are not negative')).max(100_000),
      })
      .strict(),
    files: z.array(ManifestFile).min(1, 'the manifest lists at least one result table').max(100_000),
    createdAt: z.iso.datetime({ offset: true }).optional(),
  })
  .strict()
  .meta({ id: 'ArchiveManifest' });
export type ArchiveManifest = z.infer<typeof ArchiveManifest>;

/** Limits on what verification unpacks; above them an archive is refused, not unpacked. */
export interface ArchiveLimits {
  maxEntries: number;
  maxUnpackedBytes: number;
  /** Unpacked bytes over packed bytes; beyond it the archive is treated as a decompression bomb. */
  maxCompressionRatio: number;
  maxManifestBytes: number;
  /** Rows of one CSV table. */
  maxTableRows: number;
}
export const DEFAULT_ARCHIVE_LIMITS: ArchiveLimits = {
  maxEntries: 100_000,
  maxUnpackedBytes: 256 * 1024 ** 3,
  maxCompressionRatio: 200,
  maxManifestBytes: 16 * 1024 ** 2,
  maxTableRows: 50_000_000,
};

/** Why an archive was refused: one problem per finding, with a code a script can match. */
export const ARCHIVE_PROBLEM_CODES = [
  'size-mismatch',
  'checksum-mismatch',
  'unreadable',
  'unsafe-path',
  'link-or-device',
  'duplicate-name',
  'too-many-entries',
  'too-large',
  'compression-bomb',
  'manifest-missing',
  'manifest-invalid',
  'file-not-in-manifest',
  'file-missing',
  'file-size-mismatch',
  'file-checksum-mismatch',
  'table-invalid',
  'outside-spec',
  'run-not-in-campaign',
  'campaign-mismatch',
  'wrong-type',
  'upload-cancelled',
  'upload-abandoned',
] as const;
export const ArchiveProblemCode = z.enum(ARCHIVE_PROBLEM_CODES);
export type ArchiveProblemCode = z.infer<typeof ArchiveProblemCode>;

export const ArchiveProblem = z.object({ code: ArchiveProblemCode, message: z.string(), path: z.string().optional() }).meta({ id: 'ArchiveProblem' });
export type ArchiveProblem = z.infer<typeof ArchiveProblem>;

export const ARCHIVE_STATES = ['uploading', 'received', 'checking', 'verified', 'rejected'] as const;
export const ArchiveState = z.enum(ARCHIVE_STATES);
export type ArchiveState = z.infer<typeof ArchiveState>;
export const ARCHIVE_STATE_LABELS: Record<ArchiveState, string> = {
  uploading: 'Uploading',
  received: 'Received, waiting for its check',
  checking: 'Being checked',
  verified: 'Verified',
  rejected: 'Rejected',
};

/** What is stored: a result archive, or a proposal's attachment. */
export const ARCHIVE_KINDS = ['results', 'science-case', 'pilot-timings'] as const;
export const ArchiveKind = z.enum(ARCHIVE_KINDS);
export type ArchiveKind = z.infer<typeof ArchiveKind>;
export const ARCHIVE_KIND_LABELS: Record<ArchiveKind, string> = {
  results: 'Result archive',
  'science-case': 'Science case (PDF)',
  'pilot-timings': 'Pilot timings (CSV)',
};

export const ARCHIVE_FORMATS = ['tar.gz', 'tar', 'zip', 'pdf', 'csv'] as const;
export type ArchiveFormat = (typeof ARCHIVE_FORMATS)[number];
/** Formats each kind accepts. */
export const FORMATS_OF_KIND: Record<ArchiveKind, readonly ArchiveFormat[]> = {
  results: ['tar.gz', 'tar', 'zip'],
  'science-case': ['pdf'],
  'pilot-timings': ['csv'],
};

/** The format a file name announces, or null. */
export function formatOfFileName(name: string): ArchiveFormat | null {
  const n = name.toLowerCase();
  if (n.endsWith('.tar.gz') || n.endsWith('.tgz')) return 'tar.gz';
  if (n.endsWith('.tar')) return 'tar';
  if (n.endsWith('.zip')) return 'zip';
  if (n.endsWith('.pdf')) return 'pdf';
  if (n.endsWith('.csv')) return 'csv';
  return null;
}

/** S3 allows at most 10 000 parts of at least 5 MiB (but the last). */
export const MIN_PART_BYTES = 8 * 1024 ** 2;
export const MAX_PARTS = 10_000;
export const MAX_ARCHIVE_BYTES = 5 * 1024 ** 4;
export const MAX_ATTACHMENT_BYTES = 100 * 1024 ** 2;

/** Part size for a file: 8 MiB, or larger in whole MiB so that the parts number at most 10 000. */
export function planParts(sizeBytes: number): { partSizeBytes: number; partCount: number } {
  const mib = 1024 ** 2;
  const partSizeBytes = Math.max(MIN_PART_BYTES, Math.ceil(sizeBytes / MAX_PARTS / mib) * mib);
  return { partSizeBytes, partCount: Math.max(1, Math.ceil(sizeBytes / partSizeBytes)) };
}

/** Byte range [start, end) of part n (1-based). */
export function partRange(partNumber: number, partSizeBytes: number, sizeBytes: number): { start: number; end: number } {
  const start = (partNumber - 1) * partSizeBytes;
  return { start, end: Math.min(sizeBytes, start + partSizeBytes) };
}

export const CreateArchiveRequest = z
  .object({
    kind: ArchiveKind.default('results'),
    fileName: z
      .string()
      .trim()
      .min(1, 'give the file name')
      .max(255, 'a file name may have at most 255 characters')
      .refine((n) => formatOfFileName(n) !== null, 'the file must be a .tar.gz, .tgz, .tar or .zip archive, a .pdf or a .csv'),
    sizeBytes: z.number({ message: 'sizeBytes must be a number' }).int('sizeBytes is a whole number').min(1, 'the file is empty').max(MAX_ARCHIVE_BYTES, 'an archive may be at most 5 TiB'),
    runIds: z.array(z.uuid('each run id is a UUID')).max(10_000).default([]),
  })
  .strict()
  .superRefine((r, ctx) => {
    const format = formatOfFileName(r.fileName);
    if (format && !FORMATS_OF_KIND[r.kind].includes(format)) {
      ctx.addIssue({ code: 'custom', path: ['fileName'], message: `a ${ARCHIVE_KIND_LABELS[r.kind].toLowerCase()} is a ${FORMATS_OF_KIND[r.kind].map((f) => '.' + f).join(' or ')} file` });
    }
    if (r.kind !== 'results' && r.sizeBytes > MAX_ATTACHMENT_BYTES) ctx.addIssue({ code: 'custom', path: ['sizeBytes'], message: 'an attachment may be at most 100 MiB' });
    if (r.kind !== 'results' && r.runIds.length) ctx.addIssue({ code: 'custom', path: ['runIds'], message: 'only result archives name runs' });
  })
  .meta({ id: 'CreateArchiveRequest' });
export type CreateArchiveRequest = z.infer<typeof CreateArchiveRequest>;

export const Archive = z
  .object({
    id: z.uuid(),
    campaignId: z.uuid(),
    kind: ArchiveKind,
    fileName: z.string(),
    format: z.enum(ARCHIVE_FORMATS),
    sizeBytes: z.number().int(),
    partSizeBytes: z.number().int(),
    partCount: z.number().int(),
    /** What the uploader computed; set when the upload completes. */
    declaredSha256: Sha256Hex.nullable(),
    state: ArchiveState,
    problems: z.array(ArchiveProblem),
    runIds: z.array(z.uuid()),
    manifest: ArchiveManifest.nullable(),
    uploadedByName: z.string().nullable(),
    createdAt: z.string(),
    receivedAt: z.string().nullable(),
    checkedAt: z.string().nullable(),
    withdrawnAt: z.string().nullable(),
    withdrawnReason: z.string().nullable(),
    withdrawnByName: z.string().nullable(),
    /** The archive's entry in the provenance log, once verified and sequenced. */
    provenanceEntryId: z.string().nullable(),
  })
  .meta({ id: 'Archive' });
export type Archive = z.infer<typeof Archive>;

export const ArchiveList = z.object({ items: z.array(Archive) }).meta({ id: 'ArchiveList' });
export type ArchiveList = z.infer<typeof ArchiveList>;

/** Answer to creating an upload: the archive and how to cut the file. */
export const ArchiveUpload = z.object({ archive: Archive, partSizeBytes: z.number().int(), partCount: z.number().int() }).meta({ id: 'ArchiveUpload' });
export type ArchiveUpload = z.infer<typeof ArchiveUpload>;

export const PartUrlsRequest = z
  .object({
    partNumbers: z
      .array(z.number().int('part numbers are whole numbers').min(1, 'part numbers start at 1').max(MAX_PARTS))
      .min(1, 'ask for at least one part')
      .max(100, 'ask for at most 100 part addresses at a time'),
  })
  .strict()
  .meta({ id: 'PartUrlsRequest' });
export type PartUrlsRequest = z.infer<typeof PartUrlsRequest>;

export const PartUrls = z
  .object({
    urls: z.array(z.object({ partNumber: z.number().int(), url: z.string(), expiresAt: z.string() })),
  })
  .meta({ id: 'PartUrls' });
export type PartUrls = z.infer<typeof PartUrls>;

/** The parts the store holds already: a resumed upload sends only the others. */
export const StoredParts = z
  .object({ parts: z.array(z.object({ partNumber: z.number().int(), sizeBytes: z.number().int() })) })
  .meta({ id: 'StoredParts' });
export type StoredParts = z.infer<typeof StoredParts>;

export const CompleteArchiveRequest = z.object({ sha256: Sha256Hex }).strict().meta({ id: 'CompleteArchiveRequest' });
export type CompleteArchiveRequest = z.infer<typeof CompleteArchiveRequest>;

export const WithdrawArchiveRequest = z
  .object({ reason: z.string().trim().min(10, 'say in at least 10 characters why the archive is withdrawn').max(2000) })
  .strict()
  .meta({ id: 'WithdrawArchiveRequest' });
export type WithdrawArchiveRequest = z.infer<typeof WithdrawArchiveRequest>;

export const DownloadLink = z.object({ url: z.string(), expiresAt: z.string() }).meta({ id: 'DownloadLink' });
export type DownloadLink = z.infer<typeof DownloadLink>;

/** An upload not completed within this many days is abandoned by the daily sweep (its parts are dropped). */
export const ABANDON_UPLOADS_AFTER_DAYS = 7;

/** Verification job data. */
export const VerifyArchiveJob = z.object({ archiveId: z.uuid() });
export type VerifyArchiveJob = z.infer<typeof VerifyArchiveJob>;
