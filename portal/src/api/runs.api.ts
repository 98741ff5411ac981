import type { Page, Run, RunImportRequest, RunImportResult, RunInput } from '@localis/shared';
import { apiUrl, http, request, type QueryParams } from './http-client';

/** Query of GET /campaigns/:id/runs as the portal sends it: strings as they sit in the URL. */
export interface RunsQuery extends QueryParams {
  limit?: number;
  offset?: number;
  sort?: string;
  /** Matches the job id or the code name. */
  q?: string;
  codeName?: string;
  /** ISO times: runs that started from / up to then. */
  from?: string;
  to?: string;
}

const runsOf = (campaignId: string) => `/campaigns/${encodeURIComponent(campaignId)}/runs`;

export const runsApi = {
  list: (campaignId: string, query: RunsQuery, signal?: AbortSignal) => http.get<Page<Run>>(runsOf(campaignId), query, signal),
  csvUrl: (campaignId: string, query: RunsQuery) => apiUrl(runsOf(campaignId), { ...query, format: 'csv' }),
  /** Records a run and debits the campaign's grant with it. */
  create: (campaignId: string, input: RunInput) => http.post<Run>(runsOf(campaignId), input),
  /** Checks an accounting CSV row by row and writes nothing. */
  previewImport: (campaignId: string, importRequest: RunImportRequest, signal?: AbortSignal) =>
    request<RunImportResult>('POST', `${runsOf(campaignId)}/import`, { query: { dryRun: true }, body: importRequest, signal }),
  /** Records every run of the CSV, or none when any row has a problem. */
  commitImport: (campaignId: string, importRequest: RunImportRequest) => http.post<RunImportResult>(`${runsOf(campaignId)}/import`, importRequest),
};
