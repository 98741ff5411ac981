import type { AuditEntry, Page } from '@localis/shared';
import { apiUrl, http, type QueryParams } from './http-client';

export interface AuditQuery extends QueryParams {
  limit?: number;
  offset?: number;
  sort?: string;
  action?: string;
  targetType?: string;
  targetId?: string;
  actorPersonId?: string;
  from?: string;
  to?: string;
}

export const auditApi = {
  list: (query: AuditQuery, signal?: AbortSignal) => http.get<Page<AuditEntry>>('/audit', query, signal),
  csvUrl: (query: AuditQuery) => apiUrl('/audit', { ...query, format: 'csv' }),
};
