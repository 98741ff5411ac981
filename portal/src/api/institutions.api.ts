import type { Institution, InstitutionInput, InstitutionPatch, Page } from '@localis/shared';
import { http, type QueryParams } from './http-client';

export interface InstitutionsQuery extends QueryParams {
  limit?: number;
  offset?: number;
  sort?: string;
  q?: string;
  kind?: string;
}

export const institutionsApi = {
  list: (query: InstitutionsQuery, signal?: AbortSignal) => http.get<Page<Institution>>('/institutions', query, signal),
  create: (input: InstitutionInput) => http.post<Institution>('/institutions', input),
  update: (id: string, patch: InstitutionPatch) => http.patch<Institution>(`/institutions/${encodeURIComponent(id)}`, patch),
};
