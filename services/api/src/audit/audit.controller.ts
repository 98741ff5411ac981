import type { Request, Response } from 'express';
import type { AuditEntry } from '@localis/shared';
import { sendList } from '../http/send-list';
import { auditService } from './audit.service';

export const auditController = {
  async list(req: Request, res: Response) {
    await sendList<AuditEntry, typeof req.valid.query>(res, req.valid.query, (q) => auditService.list(q), {
      filename: 'localis-audit',
      columns: ['createdAt', 'actorName', 'via', 'action', 'targetType', 'targetId', 'details', 'ip', 'id'],
    });
  },
};
