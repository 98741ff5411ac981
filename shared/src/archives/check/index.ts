/**
 * The archive checker (node only: streams, zlib, worker threads). Not exported from shared's main
 * index, which the portal imports; node code imports it through `shared/src/node.ts`.
 */
export { checkArchive, type ArchiveCheckResult, type CheckArchiveOptions } from './check-archive';
export { checkAttachment, PILOT_TIMING_COLUMNS, type AttachmentCheckResult, type AttachmentExpectation } from './check-attachment';
export { packArchive, type PackArchiveOptions } from './pack-archive';
export {
  asReadable,
  bufferSource,
  isResultArchiveFormat,
  localFileSource,
  READ_CHUNK_BYTES,
  type ArchiveSource,
  type AttachmentFormat,
  type AttachmentSource,
  type ByteRange,
  type ByteSource,
  type ResultArchiveFormat,
} from './archive-source';
export type { CampaignContext } from './manifest-checks';
export type { TablePoint, TableSummary } from './numeric-table';
export { SourceError } from './halt';
export { normalizeEntryName, unsafeNameReason } from './entry-names';
export {
  buildArchive,
  goodArchive,
  goodEntries,
  lambdaTable,
  sha256Hex,
  zerosTarGz,
  zerosZip,
  FIXTURE_CAMPAIGN_ID,
  FIXTURE_RUN_IDS,
  FIXTURE_SPEC,
  ZIP_CANNOT_HOLD,
  type BuildArchiveOptions,
  type FixtureEntry,
  type FixtureEntryType,
  type GoodArchive,
  type GoodArchiveOptions,
} from './archive-fixtures';
