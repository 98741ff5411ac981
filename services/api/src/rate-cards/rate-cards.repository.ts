import { Op, type Transaction } from 'sequelize';
import type { RateCard, RateCardInput } from '@localis/shared';
import { Person, RateCardRow } from '../db/models';

const include = [{ model: Person, as: 'createdBy', attributes: ['name'] }];

export function toRateCardDto(r: RateCardRow): RateCard {
  return {
    id: r.id,
    institutionId: r.institutionId,
    currency: r.currency,
    unitPriceMinor: Number(r.unitPriceMinor),
    tiers: r.tiers,
    discountBasisPoints: r.discountBasisPoints,
    taxRateBasisPoints: r.taxRateBasisPoints,
    reverseCharge: r.reverseCharge,
    paymentTermsDays: r.paymentTermsDays,
    effectiveFrom: r.effectiveFrom,
    effectiveTo: r.effectiveTo,
    createdAt: r.createdAt.toISOString(),
    createdByName: (r as unknown as { createdBy?: { name: string } | null }).createdBy?.name ?? null,
  };
}

export const rateCardsRepository = {
  listOf: (institutionId: string, tx?: Transaction) => RateCardRow.findAll({ where: { institutionId }, include, order: [['effectiveFrom', 'DESC']], transaction: tx }),
  find: (id: string, tx?: Transaction) => RateCardRow.findByPk(id, { include, transaction: tx }),
  latestLocked: (institutionId: string, tx: Transaction) => RateCardRow.findOne({ where: { institutionId }, order: [['effectiveFrom', 'DESC']], transaction: tx, lock: tx.LOCK.UPDATE }),
  /** The card in force on a day. */
  inForce: (institutionId: string, day: string, tx?: Transaction) =>
    RateCardRow.findOne({ where: { institutionId, effectiveFrom: { [Op.lte]: day }, [Op.or]: [{ effectiveTo: null }, { effectiveTo: { [Op.gte]: day } }] }, transaction: tx }),
  create: (values: RateCardInput & { institutionId: string; createdByPersonId: string | null }, tx: Transaction) =>
    RateCardRow.create({ ...values, tiers: values.tiers ?? [], effectiveTo: null }, { transaction: tx }),
  close: (id: string, effectiveTo: string, tx: Transaction) => RateCardRow.update({ effectiveTo }, { where: { id }, transaction: tx }),
};
