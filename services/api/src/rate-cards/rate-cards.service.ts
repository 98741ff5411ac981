import { errors, type RateCard, type RateCardInput } from '@localis/shared';
import type { Database } from '../db';
import { Institution } from '../db/models';
import type { RequestContext } from '../http/principal';
import { auditService } from '../audit/audit.service';
import { rateCardsRepository, toRateCardDto } from './rate-cards.repository';

/** The day before an ISO date (YYYY-MM-DD). */
export function dayBefore(day: string): string {
  const d = new Date(`${day}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() - 1);
  return d.toISOString().slice(0, 10);
}

/**
 * Rate cards of partner institutions. Prices change forward in time: a new card starts after the
 * latest one began, and closes it the day before. Issued invoices keep a copy of the card they
 * were priced with, so no change reaches them.
 */
export function createRateCardsService(db: Database) {
  /** The office, and the partner's own billing contacts, may read its cards. */
  async function readable(ctx: RequestContext, institutionId: string) {
    const institution = await Institution.findByPk(institutionId);
    if (!institution) throw errors.notFound('The institution');
    const p = ctx.principal!;
    if (!p.roles.includes('admin') && !(p.roles.includes('billing') && p.institutionId === institution.id)) {
      throw errors.forbidden(`The rate cards of ${institution.name} are for the consortium office and its own billing contacts.`);
    }
    return institution;
  }

  return {
    async list(ctx: RequestContext, institutionId: string): Promise<{ items: RateCard[] }> {
      await readable(ctx, institutionId);
      return { items: (await rateCardsRepository.listOf(institutionId)).map(toRateCardDto) };
    },

    async create(ctx: RequestContext, institutionId: string, input: RateCardInput): Promise<RateCard> {
      return db.transaction(async (tx) => {
        const institution = await Institution.findByPk(institutionId, { transaction: tx, lock: tx.LOCK.UPDATE });
        if (!institution) throw errors.notFound('The institution');
        if (institution.kind !== 'partner') {
          throw errors.conflict(`${institution.name} is a member institution: rate cards are for partners, who pay for their compute time.`);
        }
        const latest = await rateCardsRepository.latestLocked(institutionId, tx);
        if (latest && latest.effectiveFrom >= input.effectiveFrom) {
          throw errors.conflict(`The latest rate card of ${institution.name} starts on ${latest.effectiveFrom}; a new one must start after it (prices change forward in time).`);
        }
        if (latest && (latest.effectiveTo === null || latest.effectiveTo >= input.effectiveFrom)) await rateCardsRepository.close(latest.id, dayBefore(input.effectiveFrom), tx);
        const p = ctx.principal!;
        const created = await rateCardsRepository.create({ ...input, institutionId, createdByPersonId: p.via === 'system' ? null : p.personId }, tx);
        await auditService.record(ctx, 'rate-card.created', { type: 'institution', id: institutionId }, { rateCardId: created.id, ...input, closed: latest ? { id: latest.id, effectiveTo: dayBefore(input.effectiveFrom) } : null }, tx);
        return toRateCardDto((await rateCardsRepository.find(created.id, tx))!);
      });
    },
  };
}
export type RateCardsService = ReturnType<typeof createRateCardsService>;
