import { randomUUID } from 'node:crypto';
import type { Transaction } from 'sequelize';
import {
  errors,
  formatOfFileName,
  OUTBOX_KINDS,
  partRange,
  planParts,
  type Archive,
  type ArchiveUpload,
  type CreateArchiveRequest,
  type DownloadLink,
  type PartUrls,
  type StoredParts,
} from '@localis/shared';
import type { Database } from '../db';
import type { RequestContext } from '../http/principal';
import { actsAsAdmin } from '../http/acts-as-admin';
import { auditService } from '../audit/audit.service';
import { outboxRepository } from '../outbox/outbox.repository';
import type { CampaignRecord } from '../campaigns/campaigns.repository';
import type { CampaignsService } from '../campaigns/campaigns.service';
import { appendProvenance } from '../provenance/provenance.service';
import { withdrawalRecord } from '../provenance/provenance-records';
import { archivesRepository, type ArchiveRecord } from './archives.repository';
import { contentTypeOf, isNoSuchUpload, objectKeyOf, PRESIGNED_SECONDS, type ObjectStore, type StoredPart } from './object-store';

const GRANTED = ['granted', 'partly-granted'];

/**
 * Archives: result archives of granted campaigns and proposals' attachments, uploaded in parts
 * straight to the object store. The api plans the parts, hands out presigned part URLs, tells a
 * resumed upload which parts the store holds, and on completion checks every part before the
 * store assembles them; the worker then verifies the whole archive (see archive-verification.ts).
 */
export function createArchivesService(db: Database, store: ObjectStore, campaigns: CampaignsService) {
  /** Group members, the PI and the office upload (tokens need the archives scope: see the router). */
  async function requireUploader(ctx: RequestContext, c: CampaignRecord, tx?: Transaction): Promise<void> {
    const p = ctx.principal!;
    if (actsAsAdmin(p) || (await campaigns.isGroupMember(c, p.personId, tx))) return;
    throw errors.forbidden(`Archives of "${c.title}" are uploaded by members of ${c.groupName} or the consortium office.`);
  }

  /** The archive and its campaign, if the caller may see the campaign; 404 otherwise. */
  async function findVisible(ctx: RequestContext, id: string, tx?: Transaction, lock = false): Promise<{ a: ArchiveRecord; c: CampaignRecord }> {
    const a = await archivesRepository.find(id, tx, lock);
    if (!a) throw errors.notFound('The archive');
    const c = await campaigns.findVisible(ctx, a.campaignId, tx).catch(() => {
      throw errors.notFound('The archive');
    });
    return { a, c };
  }

  async function uploading(ctx: RequestContext, id: string, tx?: Transaction, lock = false) {
    const found = await findVisible(ctx, id, tx, lock);
    await requireUploader(ctx, found.c, tx);
    return found;
  }

  const dto = async (a: ArchiveRecord, tx?: Transaction) => (await archivesRepository.toDtos([a], tx))[0];

  /** What is wrong with the stored parts, in words the uploader can act on; [] when all is well. */
  function partProblems(a: ArchiveRecord, parts: StoredPart[]): string[] {
    const size = Number(a.sizeBytes);
    const partSize = Number(a.partSizeBytes);
    const byNumber = new Map(parts.map((p) => [p.partNumber, p]));
    const missing: number[] = [];
    const wrong: string[] = [];
    for (let n = 1; n <= a.partCount; n++) {
      const p = byNumber.get(n);
      const { start, end } = partRange(n, partSize, size);
      if (!p) missing.push(n);
      else if (p.sizeBytes !== end - start) wrong.push(`part ${n} holds ${p.sizeBytes} bytes, not ${end - start}`);
    }
    const extra = parts.filter((p) => p.partNumber > a.partCount).map((p) => p.partNumber);
    return [
      ...(missing.length ? [`${missing.length} of ${a.partCount} parts are not stored yet (${missing.slice(0, 10).join(', ')}${missing.length > 10 ? ', …' : ''})`] : []),
      ...wrong.slice(0, 10),
      ...(extra.length ? [`parts beyond the last (${extra.slice(0, 10).join(', ')}) were sent`] : []),
    ];
  }

  return {
    async create(ctx: RequestContext, campaignId: string, input: CreateArchiveRequest): Promise<ArchiveUpload> {
      return db.transaction(async (tx) => {
        const c = await campaigns.findVisible(ctx, campaignId, tx);
        await requireUploader(ctx, c, tx);
        if (input.kind === 'results' && !GRANTED.includes(c.state)) {
          throw errors.conflict(`"${c.title}" is ${c.state}: result archives are uploaded once a campaign is granted.`);
        }
        const known = await archivesRepository.runIdsOfCampaign(c.id, input.runIds, tx);
        const strangers = input.runIds.filter((r) => !known.has(r));
        if (strangers.length) {
          throw errors.invalid('Some runs named are not runs of this campaign.', strangers.map((r) => ({ path: ['runIds', input.runIds.indexOf(r)], message: `run ${r} is not a run of "${c.title}"` })));
        }
        const format = formatOfFileName(input.fileName)!;
        const { partSizeBytes, partCount } = planParts(input.sizeBytes);
        const id = randomUUID();
        const objectKey = objectKeyOf(c.id, id, format);
        const uploadId = await store.startUpload(objectKey, contentTypeOf(format));
        const row = await archivesRepository.create(
          {
            id,
            campaignId: c.id,
            kind: input.kind,
            fileName: input.fileName,
            format,
            sizeBytes: input.sizeBytes,
            objectKey,
            uploadId,
            partSizeBytes,
            partCount,
            declaredSha256: null,
            manifest: null,
            points: null,
            runIds: [...new Set(input.runIds)],
            uploadedByPersonId: ctx.principal!.via === 'system' ? null : ctx.principal!.personId,
            receivedAt: null,
            checkedAt: null,
            withdrawnAt: null,
            withdrawnReason: null,
            withdrawnByPersonId: null,
          },
          tx,
        );
        await auditService.record(ctx, 'archive.upload-started', { type: 'campaign', id: c.id }, { archiveId: id, kind: input.kind, fileName: input.fileName, sizeBytes: input.sizeBytes }, tx);
        const archive = (await archivesRepository.toDtos([(await archivesRepository.find(row.id, tx))!], tx))[0];
        return { archive, partSizeBytes, partCount };
      });
    },

    async list(ctx: RequestContext, campaignId: string): Promise<{ items: Archive[] }> {
      await campaigns.findVisible(ctx, campaignId);
      return { items: await archivesRepository.toDtos(await archivesRepository.listOfCampaign(campaignId)) };
    },

    async get(ctx: RequestContext, id: string): Promise<Archive> {
      return dto((await findVisible(ctx, id)).a);
    },

    /** Readers may ask too (it tells no more than the archive's progress). */
    async storedParts(ctx: RequestContext, id: string): Promise<StoredParts> {
      const { a } = await findVisible(ctx, id);
      if (a.state !== 'uploading' || !a.uploadId) return { parts: [] };
      const parts = await store.listParts(a.objectKey, a.uploadId).catch((e) => (isNoSuchUpload(e) ? [] : Promise.reject(e)));
      return { parts: parts.map((p) => ({ partNumber: p.partNumber, sizeBytes: p.sizeBytes })) };
    },

    async partUrls(ctx: RequestContext, id: string, partNumbers: number[]): Promise<PartUrls> {
      const { a } = await uploading(ctx, id);
      if (a.state !== 'uploading' || !a.uploadId) throw errors.conflict(`${a.fileName} is uploaded already (${a.state}); its parts can no longer be sent.`);
      const beyond = partNumbers.filter((n) => n > a.partCount);
      if (beyond.length) throw errors.invalid(`${a.fileName} has ${a.partCount} parts.`, beyond.map((n) => ({ path: ['partNumbers', partNumbers.indexOf(n)], message: `there is no part ${n}` })));
      const expiresAt = new Date(Date.now() + PRESIGNED_SECONDS * 1000).toISOString();
      const urls = await Promise.all([...new Set(partNumbers)].map(async (partNumber) => ({ partNumber, url: await store.partUrl(a.objectKey, a.uploadId!, partNumber), expiresAt })));
      return { urls };
    },

    /**
     * All parts stored: the store assembles them, the archive is received and its check queued, in
     * one transaction. Completing again with the same SHA-256 answers the same archive.
     */
    async complete(ctx: RequestContext, id: string, sha256: string): Promise<Archive> {
      return db.transaction(async (tx) => {
        const { a } = await uploading(ctx, id, tx, true);
        if (a.state !== 'uploading') {
          if (a.declaredSha256 === sha256) return dto(a, tx);
          throw errors.conflict(`${a.fileName} was completed already with another SHA-256 (${a.declaredSha256!.slice(0, 12)}…).`);
        }
        // null: the store assembled the object already (an earlier completion failed after it).
        const parts = await store.listParts(a.objectKey, a.uploadId!).catch((e) => (isNoSuchUpload(e) ? null : Promise.reject(e)));
        if (parts) {
          const problems = partProblems(a, parts);
          if (problems.length) throw errors.conflict(`${a.fileName} cannot be completed yet: ${problems.join('; ')}. Send the missing parts and complete again.`);
          await store.completeUpload(a.objectKey, a.uploadId!, parts.filter((p) => p.partNumber <= a.partCount));
        }
        const stored = await store.sizeOf(a.objectKey);
        if (stored !== Number(a.sizeBytes)) throw errors.conflict(`The store holds ${stored ?? 'no'} bytes for ${a.fileName}, not the ${a.sizeBytes} announced.`);
        await archivesRepository.markReceived(a.id, sha256, tx);
        await outboxRepository.enqueue(OUTBOX_KINDS.verifyArchive, { archiveId: a.id }, tx);
        await auditService.record(ctx, 'archive.received', { type: 'campaign', id: a.campaignId }, { archiveId: a.id, sha256, sizeBytes: Number(a.sizeBytes) }, tx);
        return dto((await archivesRepository.find(a.id, tx))!, tx);
      });
    },

    /** The uploader gives up: the parts are dropped and the archive ends rejected, with who cancelled it. */
    async cancel(ctx: RequestContext, id: string): Promise<Archive> {
      return db.transaction(async (tx) => {
        const { a } = await uploading(ctx, id, tx, true);
        if (a.state !== 'uploading') throw errors.conflict(`${a.fileName} is ${a.state}; only an unfinished upload can be cancelled (a checked archive is withdrawn instead).`);
        if (a.uploadId) await store.abortUpload(a.objectKey, a.uploadId).catch((e) => (isNoSuchUpload(e) ? undefined : Promise.reject(e)));
        await archivesRepository.endUpload(a.id, { code: 'upload-cancelled', message: `the upload was cancelled by ${ctx.principal!.name} before it was complete` }, tx);
        await auditService.record(ctx, 'archive.upload-cancelled', { type: 'campaign', id: a.campaignId }, { archiveId: a.id }, tx);
        return dto((await archivesRepository.find(a.id, tx))!, tx);
      });
    },

    async download(ctx: RequestContext, id: string): Promise<DownloadLink> {
      const { a } = await findVisible(ctx, id);
      if (a.state === 'uploading') throw errors.conflict(`${a.fileName} is still being uploaded; it can be downloaded once complete.`);
      if (a.declaredSha256 === null) throw errors.conflict(`${a.fileName} was never completed; there is nothing to download.`);
      await auditService.record(ctx, 'archive.downloaded', { type: 'campaign', id: a.campaignId }, { archiveId: a.id });
      return { url: await store.downloadUrl(a.objectKey, a.fileName), expiresAt: new Date(Date.now() + PRESIGNED_SECONDS * 1000).toISOString() };
    },

    /** The group's PI or the office withdraws a checked archive: it stays stored and in the log, marked. */
    async withdraw(ctx: RequestContext, id: string, reason: string): Promise<Archive> {
      return db.transaction(async (tx) => {
        const { a, c } = await findVisible(ctx, id, tx, true);
        const p = ctx.principal!;
        if (!actsAsAdmin(p) && c.groupPiPersonId !== p.personId) throw errors.forbidden(`Archives of "${c.title}" are withdrawn by the PI of ${c.groupName} or the consortium office.`);
        if (a.withdrawnAt) throw errors.conflict(`${a.fileName} was withdrawn already on ${a.withdrawnAt.toISOString().slice(0, 10)}.`);
        if (a.state !== 'verified' && a.state !== 'rejected') throw errors.conflict(`${a.fileName} is ${a.state}; an archive is withdrawn once its check has finished.`);
        await archivesRepository.withdraw(a.id, reason, p.via === 'system' ? null : p.personId, tx);
        if (a.state === 'verified') {
          await appendProvenance([{ record: withdrawalRecord({ id: a.id, campaignId: a.campaignId, fileName: a.fileName, reason, by: p, at: new Date().toISOString() }), subjectId: a.id }], tx);
        }
        await auditService.record(ctx, 'archive.withdrawn', { type: 'campaign', id: a.campaignId }, { archiveId: a.id, reason }, tx);
        return dto((await archivesRepository.find(a.id, tx))!, tx);
      });
    },

    verifiedIdBySha256: archivesRepository.verifiedIdBySha256,
  };
}
export type ArchivesService = ReturnType<typeof createArchivesService>;
