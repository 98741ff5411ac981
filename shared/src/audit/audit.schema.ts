import { z } from 'zod';
import { listQuery, page } from '../lists';

export const AuditEntry = z
  .object({
    id: z.string(),
    actorPersonId: z.uuid().nullable(),
    actorName: z.string().nullable(),
    via: z.enum(['session', 'token', 'system']),
    action: z.string(),
    targetType: z.string(),
    targetId: z.string().nullable(),
    details: z.record(z.string(), z.unknown()),
    ip: z.string().nullable(),
    userAgent: z.string().nullable(),
    createdAt: z.iso.datetime(),
  })
  .meta({ id: 'AuditEntry' });
export type AuditEntry = z.infer<typeof AuditEntry>;

export const AuditListQuery = listQuery(['createdAt', 'action', 'targetType'], {
  action: z.string().trim().max(100).optional(),
  targetType: z.string().trim().max(100).optional(),
  targetId: z.string().trim().max(100).optional(),
  actorPersonId: z.uuid().optional(),
  from: z.iso.datetime({ message: 'from must be an ISO 8601 date-time' }).optional(),
  to: z.iso.datetime({ message: 'to must be an ISO 8601 date-time' }).optional(),
}, '-createdAt');
export type AuditListQuery = z.infer<typeof AuditListQuery>;

export const AuditPage = page(AuditEntry).meta({ id: 'AuditPage' });
