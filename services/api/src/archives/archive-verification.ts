import type { Readable } from 'node:stream';
import { QueryTypes, type Transaction } from 'sequelize';
import type { ArchiveManifest, ArchiveProblem } from '@localis/shared';
import { checkArchive, checkAttachment, type ArchiveSource } from '@localis/shared/node';
import type { Database } from '../db';
import { campaignsRepository } from '../campaigns/campaigns.repository';
import { appendProvenance } from '../provenance/provenance.service';
import { archiveRecord } from '../provenance/provenance-records';
import { queueAutomaticAnalysis } from '../analyses/analyses.service';
import { queueSpotCheck } from '../spot-checks/spot-checks.service';
import { archivesRepository, type ArchiveRecord } from './archives.repository';
import type { ObjectStore } from './object-store';

/** Table points kept with a verified archive for the scaling analysis. */
export const MAX_KEPT_POINTS = 200_000;
/** A check renews its lease this often; a lease not renewed for CHECK_LEASE_MS is free to take. */
export const CHECK_HEARTBEAT_MS = 20_000;
export const CHECK_LEASE_MS = 90_000;

/** Thrown when another worker is checking the archive: the job is retried later. */
export class ArchiveBusy extends Error {}

/** After this many failed attempts to read an archive it is rejected as unreadable. */
export const MAX_CHECK_ATTEMPTS = 8;

export type VerificationOutcome = 'verified' | 'rejected' | 'skipped';

/** The stored object as the checker reads it: one sequential stream, or ranged reads for a zip. */
function storedSource(store: ObjectStore, a: ArchiveRecord): ArchiveSource {
  return {
    format: a.format as ArchiveSource['format'],
    sizeBytes: Number(a.sizeBytes),
    open: (range?: { start: number; end: number }): Promise<Readable> => store.read(a.objectKey, range),
  };
}

async function jobIdsOfRuns(db: Database, runIds: string[], tx: Transaction): Promise<Map<string, string>> {
  if (!runIds.length) return new Map();
  const rows = await db.sequelize.query<{ id: string; external_job_id: string }>('SELECT id, external_job_id FROM runs WHERE id = ANY(:ids::uuid[])', {
    replacements: { ids: `{${runIds.join(',')}}` },
    type: QueryTypes.SELECT,
    transaction: tx,
  });
  return new Map(rows.map((r) => [r.id, r.external_job_id]));
}

async function runIdsOfCampaign(db: Database, campaignId: string): Promise<Set<string>> {
  const rows = await db.sequelize.query<{ id: string }>('SELECT id FROM runs WHERE campaign_id = :campaignId', { replacements: { campaignId }, type: QueryTypes.SELECT });
  return new Set(rows.map((r) => r.id));
}

/**
 * Verify one received archive: stream it back from the store, check it (checksums, safe unpacking,
 * manifest, tables, the campaign's specification and runs) and record the outcome; a verified
 * archive becomes an entry of the provenance log in the same transaction. Idempotent: an archive
 * checked already is skipped, and a crash mid-check leaves it `checking`, which the retry takes up.
 */
export function createArchiveVerifier(db: Database, store: ObjectStore) {
  /**
   * Take the archive for checking under a lease: `received`, or `checking` whose holder stopped
   * renewing it (a crashed worker). Another live check means "retry later", not "done".
   */
  async function take(id: string): Promise<{ taken: ArchiveRecord } | 'done' | 'busy'> {
    return db.transaction(async (tx) => {
      const a = await archivesRepository.findLocked(id, tx);
      if (!a || (a.state !== 'received' && a.state !== 'checking')) return 'done';
      if (a.state === 'checking' && Date.now() - a.updatedAt.getTime() < CHECK_LEASE_MS) return 'busy';
      await archivesRepository.markChecking(id, tx);
      return { taken: (await archivesRepository.findLocked(id, tx))! };
    });
  }

  async function check(a: ArchiveRecord): Promise<{ problems: ArchiveProblem[]; manifest: ArchiveManifest | null; points: unknown[] | null }> {
    const expected = { sha256: a.declaredSha256!, sizeBytes: Number(a.sizeBytes) };
    const source = storedSource(store, a);
    if (a.kind !== 'results') {
      const result = await checkAttachment(source as Parameters<typeof checkAttachment>[0], expected);
      return { problems: result.problems, manifest: null, points: null };
    }
    const c = await campaignsRepository.find(a.campaignId);
    if (!c) throw new Error(`archive ${a.id}: its campaign ${a.campaignId} is gone`);
    const result = await checkArchive(source, {
      expected,
      campaign: { id: c.id, machine: c.machine, spec: c.spec, runIds: await runIdsOfCampaign(db, c.id) },
      collectRows: MAX_KEPT_POINTS,
    });
    const problems = [...result.problems];
    // Runs the uploader named must be the ones the manifest names.
    const listed = new Set(result.manifest?.runIds ?? []);
    for (const runId of a.runIds) {
      if (result.manifest && !listed.has(runId)) problems.push({ code: 'manifest-invalid', message: `run ${runId} was named at upload but the manifest does not list it` });
    }
    return { problems, manifest: result.manifest, points: problems.length ? null : result.points };
  }

  async function record(id: string, outcome: { problems: ArchiveProblem[]; manifest: ArchiveManifest | null; points: unknown[] | null }): Promise<VerificationOutcome> {
    return db.transaction(async (tx) => {
      const a = await archivesRepository.findLocked(id, tx);
      if (!a || a.state !== 'checking') return 'skipped';
      const state = outcome.problems.length ? 'rejected' : 'verified';
      await archivesRepository.markChecked(id, { state, ...outcome }, tx);
      if (state === 'verified') {
        const full = (await archivesRepository.find(id, tx))!;
        const uploadedByName = (full as unknown as { uploadedBy?: { name: string } | null }).uploadedBy?.name;
        await appendProvenance(
          [
            {
              record: archiveRecord({
                id,
                campaignId: full.campaignId,
                fileName: full.fileName,
                format: full.format,
                kind: full.kind,
                sizeBytes: Number(full.sizeBytes),
                sha256: full.declaredSha256!,
                manifest: full.manifest,
                uploadedBy: full.uploadedByPersonId && uploadedByName ? { personId: full.uploadedByPersonId, name: uploadedByName } : null,
                receivedAt: full.receivedAt!.toISOString(),
                checkedAt: full.checkedAt!.toISOString(),
                jobIdOfRun: await jobIdsOfRuns(db, full.manifest?.runIds ?? [], tx),
              }),
              subjectId: id,
            },
          ],
          tx,
        );
        // The campaign's analysis takes the new archive in (all verified archives together).
        if (full.kind === 'results') {
          await queueAutomaticAnalysis(full.campaignId, tx);
          await queueSpotCheck(full, tx);
        }
      }
      return state;
    });
  }

  return {
    async verify(archiveId: string): Promise<VerificationOutcome> {
      const took = await take(archiveId);
      if (took === 'done') return 'skipped';
      if (took === 'busy') throw new ArchiveBusy(`archive ${archiveId} is being checked by another worker; retrying later`);
      const a = took.taken;
      const heartbeat = setInterval(() => void archivesRepository.renewCheckLease(archiveId).catch(() => undefined), CHECK_HEARTBEAT_MS);
      let outcome;
      try {
        outcome = await check(a);
      } catch (e) {
        // The store or the database failed, not the archive: hand it back and let the job retry, up to a point.
        if (a.checkAttempts < MAX_CHECK_ATTEMPTS) {
          await archivesRepository.releaseCheck(archiveId).catch(() => undefined);
          throw e;
        }
        outcome = { problems: [{ code: 'unreadable' as const, message: `the archive could not be read after ${a.checkAttempts} attempts (${(e as Error).message})` }], manifest: null, points: null };
      } finally {
        clearInterval(heartbeat);
      }
      return record(archiveId, outcome);
    },
  };
}
export type ArchiveVerifier = ReturnType<typeof createArchiveVerifier>;
