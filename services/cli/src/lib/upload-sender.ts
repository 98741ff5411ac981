import type { FileHandle } from 'node:fs/promises';
import { CliError } from './cli-error';
import { backoffMs, MAX_RETRIES, partBytes, URL_REUSE_MS, urlBatch, type PartLayout } from './upload-parts';
import { FileChangedError, MAX_SLOT_BYTES, putAgents, putPart, storeErrorCode } from './upload-put';
import type { BandwidthLimit } from './upload-throughput';

/** Asks the api for presigned addresses of these parts (at most 100). */
export type AskForUrls = (partNumbers: number[]) => Promise<{ partNumber: number; url: string }[]>;

export interface SendPartsOptions {
  file: FileHandle;
  layout: PartLayout;
  /** Part numbers to send, ascending. */
  queue: number[];
  askForUrls: AskForUrls;
  parallel: number;
  signal: AbortSignal;
  limit?: BandwidthLimit;
  /** Bytes of parts in flight written so far, summed (goes down when an attempt fails). */
  onInFlightBytes?: (bytes: number) => void;
  /** A part is stored. */
  onPartStored?: (partNumber: number, bytes: number) => void;
  /** A PUT failed and will be tried again: what happened, for the log. */
  onRetry?: (partNumber: number, attempt: number, reason: string, waitMs: number) => void;
  maxRetries?: number;
  backoff?: (attempt: number) => number;
  sleep?: (ms: number, signal: AbortSignal) => Promise<void>;
  now?: () => number;
}

function sleepFor(ms: number, signal: AbortSignal): Promise<void> {
  return new Promise((resolve, reject) => {
    if (signal.aborted) return reject(signal.reason);
    const onAbort = () => {
      clearTimeout(timer);
      reject(signal.reason);
    };
    const timer = setTimeout(() => {
      signal.removeEventListener('abort', onAbort);
      resolve();
    }, ms);
    signal.addEventListener('abort', onAbort, { once: true });
  });
}

/**
 * Sends the queued parts, `parallel` at a time, each from its own buffer (so memory is `parallel`
 * part buffers whatever the file's size). A refused or failed PUT is tried again with a growing
 * wait; a 403 (most often an address that expired) first gets a fresh address. Stops at the first
 * part that keeps failing, or when `signal` aborts; parts stored until then stay stored.
 */
export async function sendParts(options: SendPartsOptions): Promise<void> {
  const { file, layout, askForUrls, signal, limit } = options;
  const maxRetries = options.maxRetries ?? MAX_RETRIES;
  const backoff = options.backoff ?? backoffMs;
  const sleep = options.sleep ?? sleepFor;
  const now = options.now ?? Date.now;
  const queue = [...options.queue];
  const parallel = Math.max(1, Math.min(options.parallel, queue.length));
  const agents = putAgents(parallel);
  const urls = new Map<number, { url: string; at: number }>();
  let urlRequest: Promise<void> | null = null;
  const inFlight = new Map<number, number>();
  const reportInFlight = () => options.onInFlightBytes?.([...inFlight.values()].reduce((a, b) => a + b, 0));
  // One failure stops the other senders: no point sending more of an upload that cannot complete.
  const stop = new AbortController();
  const stopSignal = AbortSignal.any([signal, stop.signal]);

  const fresh = (part: number): string | null => {
    const known = urls.get(part);
    return known && now() - known.at < URL_REUSE_MS ? known.url : null;
  };
  async function urlFor(part: number): Promise<string> {
    let url = fresh(part);
    // One request at a time: parallel senders mostly find their part in the batch just asked for.
    while (!url && urlRequest) {
      await urlRequest;
      url = fresh(part);
    }
    if (url) return url;
    urlRequest = (async () => {
      const asked = urlBatch(part, queue, urls, now());
      const answer = await askForUrls(asked);
      const at = now();
      for (const u of answer) urls.set(u.partNumber, { url: u.url, at });
    })().finally(() => {
      urlRequest = null;
    });
    await urlRequest;
    url = fresh(part);
    if (!url) throw new CliError(`the portal gave no address to send part ${part} to; try again later.`);
    return url;
  }

  async function sendOne(part: number, slot: Buffer): Promise<void> {
    const start = (part - 1) * layout.partSizeBytes;
    const end = start + partBytes(layout, part);
    let failures = 0;
    let renewed = false;
    let slotHolds: { start: number; end: number } | null = null;
    for (;;) {
      stopSignal.throwIfAborted();
      const url = await urlFor(part);
      let reason: string;
      try {
        const result = await putPart({
          url,
          file,
          start,
          end,
          slot,
          slotHolds,
          agents,
          signal: stopSignal,
          limit,
          onWritten: (bytes) => {
            inFlight.set(part, bytes);
            reportInFlight();
          },
        });
        slotHolds = result.slotHolds;
        inFlight.delete(part);
        reportInFlight();
        if (result.status >= 200 && result.status < 300) {
          options.onPartStored?.(part, end - start);
          return;
        }
        const code = storeErrorCode(result.body);
        reason = `the store answered ${result.status}${code ? ` ${code}` : ''}`;
        if (result.status === 403) {
          // Most likely the address expired (a long wait, a slow line): ask for a new one, once for free.
          urls.delete(part);
          if (!renewed) {
            renewed = true;
            continue;
          }
        }
      } catch (error) {
        inFlight.delete(part);
        reportInFlight();
        if (stopSignal.aborted) throw stopSignal.reason;
        if (error instanceof FileChangedError) throw new CliError(`the file changed while it was being sent (${error.message}); the upload was not completed.`);
        if (error instanceof CliError) throw error;
        reason = describeNetworkError(error);
      }
      failures += 1;
      if (failures > maxRetries) {
        throw new CliError(`part ${part} of ${layout.partCount} could not be sent after ${failures} tries: ${reason}.`, {
          hint: 'The parts sent so far are kept: run the same command again to send the rest.',
        });
      }
      const wait = backoff(failures);
      options.onRetry?.(part, failures, reason, wait);
      await sleep(wait, stopSignal);
    }
  }

  async function worker(): Promise<void> {
    let slot: Buffer | null = null;
    for (;;) {
      stopSignal.throwIfAborted();
      const part = queue.shift();
      if (part === undefined) return;
      slot ??= Buffer.allocUnsafe(Math.min(layout.partSizeBytes, MAX_SLOT_BYTES));
      await sendOne(part, slot);
    }
  }

  try {
    const results = await Promise.allSettled(
      Array.from({ length: parallel }, () =>
        worker().catch((e: unknown) => {
          stop.abort(e);
          throw e;
        }),
      ),
    );
    const failed = results.find((r): r is PromiseRejectedResult => r.status === 'rejected');
    if (failed) throw signal.aborted ? signal.reason : (stop.signal.reason ?? failed.reason);
  } finally {
    agents.destroy();
  }
}

/** A socket error in the words someone on a login node would search for. */
export function describeNetworkError(error: unknown): string {
  const e = error as { code?: string; message?: string; cause?: { code?: string; message?: string } } | undefined;
  const code = e?.code ?? e?.cause?.code;
  const reasons: Record<string, string> = {
    ECONNREFUSED: 'the store refused the connection',
    ECONNRESET: 'the connection was reset',
    EPIPE: 'the connection was closed while sending',
    ETIMEDOUT: 'the connection timed out',
    ENOTFOUND: "the store's host name is not known",
    EAI_AGAIN: "the store's host name could not be looked up (DNS)",
    ENETUNREACH: 'the network is unreachable',
    EHOSTUNREACH: 'the host is unreachable',
  };
  if (code && reasons[code]) return `${reasons[code]} (${code})`;
  return e?.message ?? String(error);
}
