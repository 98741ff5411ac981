import type { Transaction } from 'sequelize';
import { errors, OUTBOX_KINDS, type Analysis, type AnalysisRequest } from '@localis/shared';
import type { Database } from '../db';
import type { RequestContext } from '../http/principal';
import { actsAsAdmin } from '../http/acts-as-admin';
import { auditService } from '../audit/audit.service';
import { outboxRepository } from '../outbox/outbox.repository';
import type { CampaignsService } from '../campaigns/campaigns.service';
import { analysesRepository, toAnalysisDto } from './analyses.repository';

/** The analysis the worker runs after an archive is verified (the model scan chooses). */
export const AUTOMATIC_REQUEST: AnalysisRequest = { bootstrap: 200 };

/**
 * Queue an automatic analysis of a campaign inside the caller's transaction (an archive was
 * verified); one already waiting takes the new archive in when it runs.
 */
export async function queueAutomaticAnalysis(campaignId: string, tx: Transaction): Promise<void> {
  if (await analysesRepository.queuedAutomatic(campaignId, tx)) return;
  const a = await analysesRepository.create({ campaignId, request: AUTOMATIC_REQUEST, requestedByPersonId: null }, tx);
  await outboxRepository.enqueue(OUTBOX_KINDS.analyze, { analysisId: a.id }, tx);
}

/** Scaling analyses of a campaign: listed for its readers, asked for again by its group or the office. */
export function createAnalysesService(db: Database, campaigns: CampaignsService) {
  return {
    async list(ctx: RequestContext, campaignId: string): Promise<{ items: Analysis[] }> {
      await campaigns.findVisible(ctx, campaignId);
      return { items: (await analysesRepository.listOfCampaign(campaignId)).map(toAnalysisDto) };
    },

    async get(ctx: RequestContext, id: string): Promise<Analysis> {
      const a = await analysesRepository.find(id);
      if (!a) throw errors.notFound('The analysis');
      await campaigns.findVisible(ctx, a.campaignId).catch(() => {
        throw errors.notFound('The analysis');
      });
      return toAnalysisDto(a);
    },

    async request(ctx: RequestContext, campaignId: string, request: AnalysisRequest): Promise<Analysis> {
      return db.transaction(async (tx) => {
        const c = await campaigns.findVisible(ctx, campaignId, tx);
        const p = ctx.principal!;
        if (!actsAsAdmin(p) && !(await campaigns.isGroupMember(c, p.personId, tx))) {
          throw errors.forbidden(`Analyses of "${c.title}" are asked for by members of ${c.groupName} or the consortium office.`);
        }
        const a = await analysesRepository.create({ campaignId: c.id, request, requestedByPersonId: p.via === 'system' ? null : p.personId }, tx);
        await outboxRepository.enqueue(OUTBOX_KINDS.analyze, { analysisId: a.id }, tx);
        await auditService.record(ctx, 'analysis.requested', { type: 'campaign', id: c.id }, { analysisId: a.id, request }, tx);
        return toAnalysisDto((await analysesRepository.find(a.id, tx))!);
      });
    },
  };
}
export type AnalysesService = ReturnType<typeof createAnalysesService>;
