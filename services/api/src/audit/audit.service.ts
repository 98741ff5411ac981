import type { Transaction } from 'sequelize';
import type { AuditListQuery } from '@localis/shared';
import type { RequestContext } from '../http/principal';
import { auditRepository } from './audit.repository';

/** Secrets never enter the audit log, whatever a caller passes in `details`. */
const SECRET_KEYS = /secret|token|password|hash/i;

function scrub(details: Record<string, unknown>): Record<string, unknown> {
  return Object.fromEntries(Object.entries(details).map(([k, v]) => [k, SECRET_KEYS.test(k) && k !== 'tokenId' && k !== 'tokenName' ? '[removed]' : v]));
}

export const auditService = {
  /** Write one entry; pass the transaction of the change so both land or neither does. */
  record(
    ctx: RequestContext,
    action: string,
    target: { type: string; id: string | null },
    details: Record<string, unknown> = {},
    tx?: Transaction,
  ) {
    return auditRepository.append(
      {
        actorPersonId: ctx.principal && ctx.principal.via !== 'system' ? ctx.principal.personId : null,
        via: ctx.principal?.via ?? 'system',
        action,
        targetType: target.type,
        targetId: target.id,
        details: scrub(details),
        ip: ctx.ip,
        userAgent: ctx.userAgent,
      },
      tx,
    );
  },

  list(q: AuditListQuery) {
    return auditRepository.list(q);
  },
};

export const SYSTEM_CONTEXT: RequestContext = { principal: null, ip: null, userAgent: 'localis-system' };
