import type { Page, Round, RoundInput, RoundPatch } from '@localis/shared';
import { http, type QueryParams } from './http-client';

/** Query of GET /rounds as the portal sends it. */
export interface RoundsQuery extends QueryParams {
  limit?: number;
  offset?: number;
  sort?: string;
  q?: string;
  /** upcoming, open or closed. */
  status?: string;
}

const one = (id: string) => `/rounds/${encodeURIComponent(id)}`;

export const roundsApi = {
  list: (query: RoundsQuery, signal?: AbortSignal) => http.get<Page<Round>>('/rounds', query, signal),
  get: (id: string, signal?: AbortSignal) => http.get<Round>(one(id), undefined, signal),
  create: (input: RoundInput) => http.post<Round>('/rounds', input),
  update: (id: string, patch: RoundPatch) => http.patch<Round>(one(id), patch),
};
