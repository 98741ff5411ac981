import { ABANDON_UPLOADS_AFTER_DAYS } from '@localis/shared';
import type { Database } from '../db';
import { archivesRepository } from './archives.repository';
import { isNoSuchUpload, type ObjectStore } from './object-store';

/**
 * Uploads nobody completed within a week end rejected ("abandoned") and the store drops their
 * parts: the daily sweep's chore. Answers how many it ended; running it again is harmless.
 */
export async function abandonStaleUploads(db: Database, store: ObjectStore, now: Date): Promise<number> {
  const before = new Date(now.getTime() - ABANDON_UPLOADS_AFTER_DAYS * 86_400_000);
  let ended = 0;
  for (const a of await archivesRepository.staleUploads(before)) {
    if (a.uploadId) await store.abortUpload(a.objectKey, a.uploadId).catch((e) => (isNoSuchUpload(e) ? undefined : Promise.reject(e)));
    ended += await db.transaction((tx) =>
      archivesRepository.endUpload(a.id, { code: 'upload-abandoned', message: `the upload was not completed within ${ABANDON_UPLOADS_AFTER_DAYS} days; its parts were dropped` }, tx),
    );
  }
  return ended;
}
