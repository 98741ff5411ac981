import type { Request, Response } from 'express';
import { AuditListQuery, AuditPage, type AuditEntry } from '@localis/shared';
import { access, defineRoutes } from '../http/route-registry';
import { sendList } from '../http/send-list';
import { auditService } from './audit.service';

export function auditRoutes() {
  return defineRoutes([
    {
      method: 'get', path: '/audit', tag: 'audit', summary: 'The audit log: who changed what, when and from where (format=csv for all rows)',
      access: access.read(['admin']), request: { query: AuditListQuery },
      responses: { 200: { description: 'A page of entries; with format=csv, every matching row as text/csv', schema: AuditPage } },
      handler: async (req: Request, res: Response) =>
        sendList<AuditEntry, typeof req.valid.query>(res, req.valid.query, (q) => auditService.list(q), {
          filename: 'localis-audit',
          columns: ['createdAt', 'actorName', 'via', 'action', 'targetType', 'targetId', 'details', 'ip', 'id'],
        }),
    },
  ]);
}
