import type { Analysis, AnalysisList, AnalysisRequest } from '@localis/shared';
import { http } from './http-client';

const analysesOf = (campaignId: string) => `/campaigns/${encodeURIComponent(campaignId)}/analyses`;

export const analysesApi = {
  /** A campaign's analyses, newest first, each with its result once done. */
  list: (campaignId: string, signal?: AbortSignal) => http.get<AnalysisList>(analysesOf(campaignId), undefined, signal),
  get: (id: string, signal?: AbortSignal) => http.get<Analysis>(`/analyses/${encodeURIComponent(id)}`, undefined, signal),
  /** Queues an analysis of the campaign's verified archives; the worker runs it (202, state queued). */
  request: (campaignId: string, body: AnalysisRequest) => http.post<Analysis>(analysesOf(campaignId), body),
};
