/**
 * For list loads that can overlap (a person pages quickly): only the answer to the latest
 * request may land in the store; older ones are aborted and ignored.
 */
export function latestOnly() {
  let controller: AbortController | null = null;
  return {
    begin(): { signal: AbortSignal; isCurrent: () => boolean } {
      controller?.abort();
      const mine = new AbortController();
      controller = mine;
      return { signal: mine.signal, isCurrent: () => controller === mine };
    },
  };
}

export function isAbort(error: unknown): boolean {
  return error instanceof DOMException && error.name === 'AbortError';
}
