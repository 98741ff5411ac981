import type { Transaction } from 'sequelize';
import { OUTBOX_KINDS, type SpotCheckList } from '@localis/shared';
import type { RequestContext } from '../http/principal';
import { outboxRepository } from '../outbox/outbox.repository';
import type { CampaignsService } from '../campaigns/campaigns.service';
import { spotChecksRepository, toSpotCheckDto } from './spot-checks.repository';

/**
 * Queue the spot-check of a result archive inside the caller's transaction (it was just verified).
 * Whether the kernel can check it is decided when it runs, with the reason kept.
 */
export async function queueSpotCheck(archive: { id: string; campaignId: string }, tx: Transaction): Promise<void> {
  const created = await spotChecksRepository.createOnce({ archiveId: archive.id, campaignId: archive.campaignId }, tx);
  if (created) await outboxRepository.enqueue(OUTBOX_KINDS.spotCheck, { spotCheckId: created.id }, tx);
}

/** A campaign's spot-checks, for whoever may read its analyses. */
export function createSpotChecksService(campaigns: CampaignsService) {
  return {
    async list(ctx: RequestContext, campaignId: string): Promise<SpotCheckList> {
      await campaigns.findVisible(ctx, campaignId);
      return { items: (await spotChecksRepository.listOfCampaign(campaignId)).map(toSpotCheckDto) };
    },
  };
}
export type SpotChecksService = ReturnType<typeof createSpotChecksService>;
