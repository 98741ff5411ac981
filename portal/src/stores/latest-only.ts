/**
 * For list loads that can overlap (a person pages quickly): only the answer to the latest
 * request may land in the store; older ones are aborted and ignored.
 */
/** Bumped at sign-out: answers to requests made before it belong to the last person and are dropped. */
let generation = 0;

export function forgetRequestsInFlight(): void {
  generation++;
}

export function latestOnly() {
  let controller: AbortController | null = null;
  return {
    begin(): { signal: AbortSignal; isCurrent: () => boolean } {
      controller?.abort();
      const mine = new AbortController();
      controller = mine;
      const born = generation;
      return { signal: mine.signal, isCurrent: () => controller === mine && born === generation };
    },
  };
}

export function isAbort(error: unknown): boolean {
  return error instanceof DOMException && error.name === 'AbortError';
}
