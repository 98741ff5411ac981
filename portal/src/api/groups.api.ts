import type { Page, ResearchGroup, ResearchGroupDetail } from '@localis/shared';
import { http, type QueryParams } from './http-client';

/** Query of GET /groups as the portal sends it. */
export interface GroupsQuery extends QueryParams {
  limit?: number;
  offset?: number;
  sort?: string;
  q?: string;
  institutionId?: string;
  /** 'true': only the groups the caller belongs to or leads. */
  mine?: string;
}

export const groupsApi = {
  list: (query: GroupsQuery, signal?: AbortSignal) => http.get<Page<ResearchGroup>>('/groups', query, signal),
  get: (id: string, signal?: AbortSignal) => http.get<ResearchGroupDetail>(`/groups/${encodeURIComponent(id)}`, undefined, signal),
};
