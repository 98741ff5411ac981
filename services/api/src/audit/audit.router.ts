import { AuditListQuery, AuditPage } from '@localis/shared';
import { access, defineRoutes } from '../http/route-registry';
import { auditController } from './audit.controller';

export function auditRoutes() {
  return defineRoutes([
    {
      method: 'get', path: '/audit', tag: 'audit', summary: 'The audit log: who changed what, when and from where (format=csv for all rows)',
      access: access.read(['admin']), request: { query: AuditListQuery },
      responses: { 200: { description: 'A page of entries; with format=csv, every matching row as text/csv', schema: AuditPage } },
      handler: auditController.list,
    },
  ]);
}
