import type { Run, RunImportRequest, RunImportResult, RunInput } from '@localis/shared';
import { defineStore } from 'pinia';
import { runsApi, type RunsQuery } from '../api/runs.api';
import { isAbort, latestOnly } from './latest-only';
import { usePagedList } from './paged-list';

/** One page of a campaign's runs table: which campaign, and the table's query. */
export interface CampaignRunsQuery {
  campaignId: string;
  query: RunsQuery;
}

export const useRunsStore = defineStore('runs', () => {
  const { items, total, loading, load } = usePagedList((q: CampaignRunsQuery, signal: AbortSignal) => runsApi.list(q.campaignId, q.query, signal));
  const previews = latestOnly();

  /** Records a run; it heads the table until the next load puts it where the sort says. */
  async function record(campaignId: string, input: RunInput): Promise<Run> {
    const run = await runsApi.create(campaignId, input);
    items.value = [run, ...items.value.filter((r) => r.id !== run.id)];
    total.value += 1;
    return run;
  }

  /**
   * Checks a CSV without writing. Previews overlap while a person changes the mapping: only the
   * answer to the latest one is returned, older ones give null.
   */
  async function previewImport(campaignId: string, request: RunImportRequest): Promise<RunImportResult | null> {
    const { signal, isCurrent } = previews.begin();
    try {
      const result = await runsApi.previewImport(campaignId, request, signal);
      return isCurrent() ? result : null;
    } catch (error) {
      if (isAbort(error)) return null;
      throw error;
    }
  }

  const commitImport = (campaignId: string, request: RunImportRequest) => runsApi.commitImport(campaignId, request);

  return { items, total, loading, load, record, previewImport, commitImport };
});
