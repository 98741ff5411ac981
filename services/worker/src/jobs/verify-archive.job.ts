import { QUEUES, VerifyArchiveJob } from '@localis/shared';
import { createArchiveVerifier, type ArchiveVerifier } from '@localis/api/archives/archive-verification';
import { createObjectStore } from '@localis/api/archives/object-store';
import type { JobDefinition, JobDeps } from './job';

let verifier: ArchiveVerifier | null = null;
const verifierOf = (deps: JobDeps) => (verifier ??= createArchiveVerifier(deps.db, createObjectStore(deps.settings)));

/**
 * Check an uploaded archive (queued by the upload's completion through the outbox). Safe to run
 * twice: a checked archive is skipped, and an interrupted check is taken up again.
 */
export const verifyArchiveJob: JobDefinition<typeof VerifyArchiveJob> = {
  name: QUEUES.verifyArchive,
  schema: VerifyArchiveJob,
  // Each check streams a whole archive through SHA-256 and gunzip: two at a time keep a core free.
  concurrency: 2,
  async process(data, deps) {
    const started = Date.now();
    const outcome = await verifierOf(deps).verify(data.archiveId);
    const ms = Date.now() - started;
    // The worker's peak RSS so far (a high-water mark): `npm run bench:archives` reads it from the
    // completed job to show that memory stays flat in the archive's size.
    const maxRssBytes = process.resourceUsage().maxRSS * 1024;
    deps.logger.info({ archiveId: data.archiveId, outcome, ms, maxRssBytes }, 'archive checked');
    return { outcome, ms, maxRssBytes };
  },
};
