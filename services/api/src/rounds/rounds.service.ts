import { UniqueConstraintError } from 'sequelize';
import { DEFAULT_ALLOCATION_DAYS, errors, formatCoreHours, type RoundInput, type RoundListQuery, type RoundPatch } from '@localis/shared';
import type { Database } from '../db';
import type { RequestContext } from '../http/principal';
import { auditService } from '../audit/audit.service';
import { roundsRepository } from './rounds.repository';
import { ledgerRepository } from '../ledger/ledger.repository';

const duplicateName = (name: string) => errors.conflict(`A round named "${name}" exists already; choose another name.`);

/** Allocation rounds: the office opens them with a pool of core-hours per machine. */
export function createRoundsService(db: Database) {
  return {
    list: (q: RoundListQuery) => roundsRepository.list(q),

    async get(id: string) {
      const round = await roundsRepository.find(id);
      if (!round) throw errors.notFound('The round');
      return round;
    },

    create(ctx: RequestContext, input: RoundInput, fixedId?: string) {
      return db.transaction(async (tx) => {
        let id: string;
        try {
          const allocationEndsAt = input.allocationEndsAt ?? new Date(new Date(input.closesAt).getTime() + DEFAULT_ALLOCATION_DAYS * 86_400_000).toISOString();
          id = await roundsRepository.create({ ...input, id: fixedId, allocationEndsAt, overdraftPercent: input.overdraftPercent ?? 0 }, tx);
        } catch (e) {
          if (e instanceof UniqueConstraintError) throw duplicateName(input.name);
          throw e;
        }
        await roundsRepository.replacePools(id, input.pools, tx);
        await auditService.record(ctx, 'round.created', { type: 'round', id }, { ...input }, tx);
        return (await roundsRepository.find(id, tx))!;
      });
    },

    update(ctx: RequestContext, id: string, patch: RoundPatch) {
      return db.transaction(async (tx) => {
        const round = await roundsRepository.find(id, tx, 'update');
        if (!round) throw errors.notFound('The round');
        const opensAt = patch.opensAt ?? round.opensAt;
        const closesAt = patch.closesAt ?? round.closesAt;
        if (new Date(closesAt) <= new Date(opensAt)) {
          throw errors.invalid('A round must close after it opens.', [{ path: ['closesAt'], message: 'a round must close after it opens' }]);
        }
        if (new Date(patch.allocationEndsAt ?? round.allocationEndsAt) <= new Date(closesAt)) {
          throw errors.invalid('The allocation period must end after the round closes.', [{ path: ['allocationEndsAt'], message: 'the allocation period must end after the round closes' }]);
        }
        if (patch.pools) {
          const inUse = await roundsRepository.machinesInUse(id, tx);
          const dropped = inUse.filter((m) => !patch.pools!.some((p) => p.machine === m));
          if (dropped.length) {
            throw errors.conflict(`Campaigns of this round draw on ${dropped.join(', ')}; keep ${dropped.length > 1 ? 'those pools' : 'that pool'} or move the campaigns first.`);
          }
          // Lock the pools first, so a grant decided at the same moment is counted.
          await ledgerRepository.lockPools(id, tx);
          const granted = await ledgerRepository.grantedPerMachine(id, tx);
          const tooSmall = patch.pools.filter((p) => p.coreHours * 1000 < (granted.get(p.machine) ?? 0));
          if (tooSmall.length) {
            throw errors.conflict(
              tooSmall.map((p) => `${p.machine} has ${formatCoreHours(granted.get(p.machine)!)} core-hours granted already`).join('; ') + '; a pool cannot be smaller than what it has granted.',
            );
          }
          await roundsRepository.replacePools(id, patch.pools, tx);
        }
        try {
          await roundsRepository.update(id, patch, tx);
        } catch (e) {
          if (e instanceof UniqueConstraintError) throw duplicateName(patch.name ?? '');
          throw e;
        }
        await auditService.record(ctx, 'round.updated', { type: 'round', id }, { ...patch }, tx);
        return (await roundsRepository.find(id, tx))!;
      });
    },
  };
}
export type RoundsService = ReturnType<typeof createRoundsService>;
