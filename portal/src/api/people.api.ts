import type { Page, Person, PersonInput, PersonPatch, Role } from '@localis/shared';
import { apiUrl, http, type QueryParams } from './http-client';

/** Query of GET /people as the portal sends it: strings as they sit in the URL. */
export interface PeopleQuery extends QueryParams {
  limit?: number;
  offset?: number;
  sort?: string;
  q?: string;
  role?: string;
  institutionId?: string;
  active?: string;
  linked?: string;
}

const one = (id: string) => `/people/${encodeURIComponent(id)}`;

export const peopleApi = {
  list: (query: PeopleQuery, signal?: AbortSignal) => http.get<Page<Person>>('/people', query, signal),
  csvUrl: (query: PeopleQuery) => apiUrl('/people', { ...query, format: 'csv' }),
  create: (input: PersonInput) => http.post<Person>('/people', input),
  update: (id: string, patch: PersonPatch) => http.patch<Person>(one(id), patch),
  grantRole: (id: string, role: Role) => http.put<Person>(`${one(id)}/roles/${role}`),
  revokeRole: (id: string, role: Role) => http.delete<Person>(`${one(id)}/roles/${role}`),
};
