import { TOKEN_SCOPES } from '@localis/shared';
import type { Database } from '../db';
import type { RequestContext } from '../http/principal';
import { createCampaignsService } from '../campaigns/campaigns.service';
import { createLedgerService } from './ledger.service';

/**
 * Localis itself, acting as the office for scheduled work (expiry at the end of an allocation
 * period). `via: 'system'` keeps the audit log from naming a person who did nothing.
 */
export const SCHEDULER_CONTEXT: RequestContext = {
  principal: { personId: '00000000-0000-0000-0000-000000000000', name: 'Localis', email: 'system@localis.invalid', institutionId: null, roles: ['admin'], scopes: [...TOKEN_SCOPES], via: 'system' },
  ip: null,
  userAgent: 'localis-scheduler',
};

/** Expire what is left of every grant whose round's allocation period has ended; returns how many. */
export async function expireEndedAllocations(db: Database, now = new Date()): Promise<number> {
  const campaigns = createCampaignsService(db);
  return createLedgerService(db, campaigns).expireEndedAllocations(SCHEDULER_CONTEXT, now);
}
