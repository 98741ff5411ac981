import { partRange } from '@localis/shared';

/** How the api cut the file: its size, the part size and the number of parts. */
export interface PartLayout {
  sizeBytes: number;
  partSizeBytes: number;
  partCount: number;
}

/** What is left to send of an upload, given the parts the store holds already. */
export interface PartPlan {
  /** Part numbers to send, ascending. */
  queue: number[];
  /** Parts the store holds with the right size: not sent again. */
  storedCount: number;
  storedBytes: number;
}

export function partBytes(layout: PartLayout, partNumber: number): number {
  const { start, end } = partRange(partNumber, layout.partSizeBytes, layout.sizeBytes);
  return end - start;
}

/**
 * The parts still to send. A stored part of the wrong size (a PUT cut short, or a file that changed)
 * is sent again, and parts beyond the last are ignored: completing checks them all anyway.
 */
export function planParts(layout: PartLayout, stored: readonly { partNumber: number; sizeBytes: number }[]): PartPlan {
  const good = new Set(stored.filter((p) => p.partNumber >= 1 && p.partNumber <= layout.partCount && p.sizeBytes === partBytes(layout, p.partNumber)).map((p) => p.partNumber));
  const queue: number[] = [];
  let storedBytes = 0;
  for (let n = 1; n <= layout.partCount; n++) {
    if (good.has(n)) storedBytes += partBytes(layout, n);
    else queue.push(n);
  }
  return { queue, storedCount: good.size, storedBytes };
}

/** The api hands out at most this many part addresses per request. */
export const URL_BATCH = 100;
/** Presigned part addresses last 15 minutes; older than this they are asked for again before use. */
export const URL_REUSE_MS = 10 * 60 * 1000;

/**
 * The parts to ask addresses for when `first` needs one: it, then the next parts of the queue whose
 * address is missing or getting old, so that parallel senders mostly find theirs in one batch.
 */
export function urlBatch(first: number, queue: readonly number[], known: ReadonlyMap<number, { at: number }>, now: number): number[] {
  const stale = (n: number) => {
    const k = known.get(n);
    return !k || now - k.at >= URL_REUSE_MS;
  };
  const batch = [first];
  for (const n of queue) {
    if (batch.length >= URL_BATCH) break;
    if (n !== first && stale(n)) batch.push(n);
  }
  return batch;
}

/** A failed PUT is tried again this many times (after the first), with a growing wait. */
export const MAX_RETRIES = 5;

/** Wait before retry `attempt` (1-based): 1, 2, 4, 8, 16 s, at most 30 s, with up to 25 % jitter so parallel senders do not retry in step. */
export function backoffMs(attempt: number, random: () => number = Math.random): number {
  const base = Math.min(30_000, 1000 * 2 ** (attempt - 1));
  return Math.round(base * (1 + 0.25 * random()));
}
