import type { Analysis, AnalysisState } from '@localis/shared';

/** States the worker has still to finish: the page asks again every 2 s while one is shown. */
const MOVING_ANALYSIS_STATES: readonly AnalysisState[] = ['queued', 'running'];

export function isMoving(analysis: Pick<Analysis, 'state'>): boolean {
  return MOVING_ANALYSIS_STATES.includes(analysis.state);
}

export const ANALYSIS_STATE_WORDS: Record<AnalysisState, string> = {
  queued: 'Waiting for the worker',
  running: 'Running',
  done: 'Done',
  failed: 'Failed',
};

/** The newest analysis with a result: what the page shows unless another is picked. */
export function latestFinished(items: readonly Analysis[]): Analysis | null {
  return newestFirst(items).find((a) => a.state === 'done' && a.result) ?? null;
}

/** Newest first by when they were asked for (the api sends them so; a put-in one may not be). */
export function newestFirst(items: readonly Analysis[]): Analysis[] {
  return [...items].sort((a, b) => b.createdAt.localeCompare(a.createdAt));
}

/** How far a running analysis is, in whole percent; null before the worker has counted its fits. */
export function progressPercent(progress: Analysis['progress']): number | null {
  if (!progress || progress.total <= 0) return null;
  return Math.min(100, Math.max(0, Math.floor((progress.done / progress.total) * 100)));
}

/** Which analysis to show: the one picked (by id in the address) if it is there and finished, else the latest finished one. */
export function shownAnalysis(items: readonly Analysis[], pickedId: string | null): Analysis | null {
  const picked = pickedId ? items.find((a) => a.id === pickedId) : undefined;
  if (picked && (picked.state === 'done' || picked.state === 'failed')) return picked;
  return latestFinished(items);
}

/**
 * A failed analysis's reason, as a sentence: the worker's words when it gave some (they say what
 * was wrong with the table), a plain fallback when it did not.
 */
export function failureWords(analysis: Pick<Analysis, 'error'>): string {
  const text = analysis.error?.trim();
  if (!text) return 'The worker stopped without saying why. Run the analysis again; if it fails again, tell the office.';
  return /[.!?…]$/.test(text) ? text : `${text}.`;
}
