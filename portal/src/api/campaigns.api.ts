import type { Campaign, CampaignInput, CampaignPatch, CampaignSpec, CampaignSummary, EstimateReport, Page } from '@localis/shared';
import { apiUrl, http, type QueryParams } from './http-client';

/** Query of GET /campaigns as the portal sends it: strings as they sit in the URL. */
export interface CampaignsQuery extends QueryParams {
  limit?: number;
  offset?: number;
  sort?: string;
  q?: string;
  /** mine, my-groups or all (what the caller may see). */
  scope?: string;
  state?: string;
  roundId?: string;
  groupId?: string;
  method?: string;
  dimension?: string;
  symmetryClass?: string;
}

const one = (id: string) => `/campaigns/${encodeURIComponent(id)}`;
const note = (text?: string) => (text?.trim() ? { note: text.trim() } : {});

export const campaignsApi = {
  list: (query: CampaignsQuery, signal?: AbortSignal) => http.get<Page<CampaignSummary>>('/campaigns', query, signal),
  csvUrl: (query: CampaignsQuery) => apiUrl('/campaigns', { ...query, format: 'csv' }),
  get: (id: string, signal?: AbortSignal) => http.get<Campaign>(one(id), undefined, signal),
  create: (input: CampaignInput) => http.post<Campaign>('/campaigns', input),
  update: (id: string, patch: CampaignPatch) => http.patch<Campaign>(one(id), patch),
  submit: (id: string, text?: string) => http.post<Campaign>(`${one(id)}/submit`, note(text)),
  withdraw: (id: string, text?: string) => http.post<Campaign>(`${one(id)}/withdraw`, note(text)),
  startReview: (id: string, text?: string) => http.post<Campaign>(`${one(id)}/start-review`, note(text)),
  /** The server's own estimate of a specification; the form computes the same one in the browser. */
  estimate: (spec: CampaignSpec) => http.post<EstimateReport>('/estimates', spec),
};
