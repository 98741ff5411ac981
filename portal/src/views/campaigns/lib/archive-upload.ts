import { partRange, type Archive, type ArchiveKind, TransferRate } from '@localis/shared';
import { createSHA256, type IHasher } from 'hash-wasm';
import { isApiError } from '../../../api/api-error';
import { archivesApi } from '../../../api/archives.api';
import { forgetUpload, rememberUpload } from './archive-upload-memory';

/**
 * Uploads one file to the object store in parts, straight from the browser: the api hands out
 * presigned part addresses and the bytes never pass through it. The SHA-256 of the whole file
 * is computed on the way, in order, so the worker can check that what arrived is what was sent.
 * No framework here: the archives page wraps it in a composable, and tests drive it with a fake fetch.
 */

export type UploadState = 'preparing' | 'uploading' | 'paused' | 'completing' | 'done' | 'failed';

export interface UploadProgress {
  /** Bytes the store holds: parts sent now and parts it had already. */
  sentBytes: number;
  totalBytes: number;
  /** Bytes read into the SHA-256 so far (parts already stored are read too, not sent). */
  hashedBytes: number;
  /** Smoothed over the last ~5 s; 0 while nothing moves. */
  bytesPerSecond: number;
  /** At the current speed; null when it cannot be told. */
  secondsLeft: number | null;
  state: UploadState;
  /** What went wrong or why it paused, in words the person can act on. */
  error?: string;
}

/** A picked file (a File has all of these; a Blob needs a name). */
export type UploadFile = Blob & { name: string; lastModified?: number };

export interface ArchiveUploadOptions {
  file: UploadFile;
  campaignId: string;
  kind: ArchiveKind;
  /** Runs the archive holds results of (result archives only). */
  runIds?: string[];
  /** Go on with this unfinished upload of the same file instead of starting a new one. */
  resumeArchiveId?: string;
  onProgress?: (progress: UploadProgress) => void;
  /** Parts sent at the same time. */
  parallel?: number;
  /** Tries after the first for a part the store refuses (not counting an expired address). */
  maxRetries?: number;
  /** Wait before retry `attempt` (1-based). */
  backoffMs?: (attempt: number) => number;
  /** Bytes read into the hash at a time, so memory stays small whatever the part size. */
  hashChunkBytes?: number;
  storage?: Storage | null;
  /** Announces 'online' when the connection is back (the window). */
  connection?: EventTarget | null;
  now?: () => number;
}

/** A failure explained for the person; anything else is shown through its own message. */
export class UploadError extends Error {
  override name = 'UploadError';
}

export const CONNECTION_LOST =
  'The connection dropped. The upload goes on by itself when you are back online, or press Resume to try now. Parts already sent are kept.';
const CANCELLED = 'The upload was cancelled.';
/** Presigned part addresses last about 15 minutes; older ones are asked for again before use. */
const URL_REUSE_MS = 10 * 60 * 1000;
const URL_BATCH = 100;
const MIB = 1024 ** 2;

function defaultBackoff(attempt: number): number {
  return Math.min(30_000, 1000 * 2 ** (attempt - 1));
}

const sleep = (ms: number) => new Promise<void>((resolve) => setTimeout(resolve, ms));

function isAbort(error: unknown): boolean {
  return error instanceof DOMException && error.name === 'AbortError';
}

/** The api could not be reached at all (http-client reports status 0). */
function isUnreachable(error: unknown): boolean {
  return isApiError(error) && error.status === 0;
}

interface Gate {
  promise: Promise<void>;
  open: () => void;
}

function closedGate(): Gate {
  let open!: () => void;
  const promise = new Promise<void>((resolve) => (open = resolve));
  return { promise, open };
}

export class ArchiveUploader {
  private readonly file: UploadFile;
  private readonly opts: Required<Pick<ArchiveUploadOptions, 'parallel' | 'maxRetries' | 'backoffMs' | 'hashChunkBytes' | 'now'>> & ArchiveUploadOptions;
  private readonly rate = new TransferRate(5000);

  private id: string | null = null;
  private partSizeBytes = 0;
  private partCount = 0;
  private queue: number[] = [];
  private readonly urls = new Map<number, { url: string; at: number }>();
  private urlRequest: Promise<void> | null = null;
  private readonly inFlight = new Set<AbortController>();
  private gate: Gate | null = null;
  private pausedFor: 'person' | 'connection' | null = null;
  private stopped: 'cancelled' | 'failed' | null = null;
  private ticker: ReturnType<typeof setInterval> | undefined;
  private started = false;

  private current: UploadProgress;

  constructor(options: ArchiveUploadOptions) {
    this.file = options.file;
    this.opts = {
      parallel: 4,
      maxRetries: 5,
      backoffMs: defaultBackoff,
      hashChunkBytes: 8 * MIB,
      now: () => Date.now(),
      ...options,
    };
    this.current = { sentBytes: 0, totalBytes: options.file.size, hashedBytes: 0, bytesPerSecond: 0, secondsLeft: null, state: 'preparing' };
  }

  get progress(): UploadProgress {
    return this.current;
  }

  /** The archive being uploaded, once the api has made it (to resume it later). */
  get archiveId(): string | null {
    return this.id;
  }

  /** Sends the file and completes the upload; resolves with the archive as the api then has it. */
  async start(): Promise<Archive> {
    if (this.started) throw new Error('an ArchiveUploader runs once; make a new one to go on');
    this.started = true;
    const connection = this.opts.connection === undefined ? (globalThis.window ?? null) : this.opts.connection;
    const onOnline = () => {
      if (this.pausedFor === 'connection') this.resume();
    };
    connection?.addEventListener('online', onOnline);
    try {
      this.update({ state: 'preparing' });
      const hasher = await this.startHash();
      await this.prepare();
      this.throwIfStopped();
      this.update({ state: 'uploading' });
      this.sampleRate();
      this.ticker = setInterval(() => this.sampleRate(), 1000);
      const [sha256] = await Promise.all([this.hashFile(hasher), this.sendAll()]);
      this.throwIfStopped();
      clearInterval(this.ticker);
      this.update({ state: 'completing', bytesPerSecond: 0, secondsLeft: null });
      const archive = await archivesApi.complete(this.id!, sha256);
      forgetUpload(this.id!, this.opts.storage);
      this.update({ state: 'done', error: undefined });
      return archive;
    } catch (error) {
      if (this.stopped !== 'cancelled') this.stopped = 'failed';
      else if (this.id) forgetUpload(this.id, this.opts.storage);
      this.abortInFlight();
      this.gate?.open();
      const message = this.stopped === 'cancelled' ? CANCELLED : messageOf(error);
      this.update({ state: 'failed', error: message, bytesPerSecond: 0, secondsLeft: null });
      throw error instanceof UploadError || isApiError(error) ? error : new UploadError(message);
    } finally {
      clearInterval(this.ticker);
      connection?.removeEventListener('online', onOnline);
    }
  }

  /** Stops sending; parts cut off half-way are sent again on resume. */
  pause(): void {
    this.pauseFor('person');
  }

  resume(): void {
    if (this.current.state !== 'paused' || !this.gate) return;
    const gate = this.gate;
    this.gate = null;
    this.pausedFor = null;
    this.rate.reset();
    this.update({ state: 'uploading', error: undefined });
    this.sampleRate();
    gate.open();
  }

  /** Gives up: nothing more is sent, this browser forgets the upload and the server drops its parts. */
  cancel(): void {
    if (this.current.state === 'done' || this.stopped) return;
    this.stopped = 'cancelled';
    if (this.id) {
      forgetUpload(this.id, this.opts.storage);
      // Best effort: an upload nobody cancels is abandoned by the daily sweep after a week anyway.
      archivesApi.cancel(this.id).catch(() => undefined);
    }
    this.abortInFlight();
    this.gate?.open();
  }

  private pauseFor(reason: 'person' | 'connection', error?: string): void {
    if (this.current.state === 'paused') {
      // A drop noticed by several parts at once: one pause, one message.
      if (reason === 'connection' && this.pausedFor === 'connection') this.update({ error });
      return;
    }
    if (this.current.state !== 'uploading') return;
    this.pausedFor = reason;
    this.gate = closedGate();
    this.abortInFlight();
    this.rate.reset();
    this.update({ state: 'paused', error, bytesPerSecond: 0, secondsLeft: null });
  }

  private async startHash(): Promise<IHasher> {
    try {
      return await createSHA256();
    } catch {
      throw new UploadError(
        'This browser could not start the SHA-256 checksum (WebAssembly is switched off or blocked). Upload with the localis command-line tool instead.',
      );
    }
  }

  /** Makes the upload, or finds what the store holds of an unfinished one; fills the queue. */
  private async prepare(): Promise<void> {
    const { file, opts } = this;
    let stored = new Set<number>();
    if (opts.resumeArchiveId) {
      const archive = await archivesApi.get(opts.resumeArchiveId);
      this.id = archive.id;
      if (archive.state !== 'uploading') {
        forgetUpload(archive.id, opts.storage);
        throw new UploadError(`${archive.fileName} was uploaded completely already; there is nothing left to send.`);
      }
      if (archive.sizeBytes !== file.size) {
        throw new UploadError(`This file has ${file.size.toLocaleString('en')} bytes, the unfinished upload ${archive.sizeBytes.toLocaleString('en')}: it is not the same file.`);
      }
      this.partSizeBytes = archive.partSizeBytes;
      this.partCount = archive.partCount;
      const { parts } = await archivesApi.storedParts(archive.id);
      // A part of the wrong size was cut short: it is sent again.
      stored = new Set(parts.filter((p) => p.partNumber <= this.partCount && p.sizeBytes === this.partSize(p.partNumber)).map((p) => p.partNumber));
    } else {
      const runIds = opts.kind === 'results' && opts.runIds?.length ? opts.runIds : undefined;
      const upload = await archivesApi.create(opts.campaignId, { kind: opts.kind, fileName: file.name, sizeBytes: file.size, ...(runIds ? { runIds } : {}) });
      this.id = upload.archive.id;
      this.partSizeBytes = upload.partSizeBytes;
      this.partCount = upload.partCount;
      rememberUpload(
        {
          archiveId: this.id,
          campaignId: opts.campaignId,
          kind: opts.kind,
          fileName: file.name,
          sizeBytes: file.size,
          lastModified: file.lastModified ?? 0,
          startedAt: new Date().toISOString(),
        },
        opts.storage,
      );
    }
    let already = 0;
    this.queue = [];
    for (let n = 1; n <= this.partCount; n++) {
      if (stored.has(n)) already += this.partSize(n);
      else this.queue.push(n);
    }
    this.update({ sentBytes: already });
  }

  private partSize(partNumber: number): number {
    const { start, end } = partRange(partNumber, this.partSizeBytes, this.file.size);
    return end - start;
  }

  /** Reads the whole file in order into the hash, stored parts included. */
  private async hashFile(hasher: IHasher): Promise<string> {
    hasher.init();
    const size = this.file.size;
    for (let start = 0; start < size; start += this.opts.hashChunkBytes) {
      await this.whenRunning();
      const end = Math.min(size, start + this.opts.hashChunkBytes);
      let bytes: ArrayBuffer;
      try {
        bytes = await this.file.slice(start, end).arrayBuffer();
      } catch {
        throw new UploadError(`${this.file.name} could not be read: it may have been moved or changed since you picked it. Pick it again.`);
      }
      hasher.update(new Uint8Array(bytes));
      this.update({ hashedBytes: end });
    }
    return hasher.digest('hex');
  }

  private async sendAll(): Promise<void> {
    const workers = Array.from({ length: Math.max(1, Math.min(this.opts.parallel, this.queue.length)) }, () => this.sendParts());
    await Promise.all(workers);
  }

  /** One of the parallel senders: takes the next part until none is left. */
  private async sendParts(): Promise<void> {
    for (;;) {
      await this.whenRunning();
      const part = this.queue.shift();
      if (part === undefined) return;
      if (!(await this.sendPart(part))) {
        // Cut off by a pause or a dropped connection: it goes again, in its turn.
        this.queue.push(part);
        this.queue.sort((a, b) => a - b);
      }
    }
  }

  /** True once the store holds the part; false when it was interrupted and must be sent again. */
  private async sendPart(part: number): Promise<boolean> {
    let failures = 0;
    let renewed = false;
    for (;;) {
      if (this.gate || this.stopped) return false;
      let url: string;
      try {
        url = await this.urlFor(part);
      } catch (error) {
        if (!isUnreachable(error)) throw error;
        this.pauseFor('connection', CONNECTION_LOST);
        return false;
      }
      if (this.gate || this.stopped) return false;

      const { start, end } = partRange(part, this.partSizeBytes, this.file.size);
      const controller = new AbortController();
      this.inFlight.add(controller);
      let response: Response;
      try {
        // Plain and cross-origin: no cookies, no headers the presigned signature does not cover.
        response = await fetch(url, { method: 'PUT', body: this.file.slice(start, end), credentials: 'omit', signal: controller.signal });
      } catch (error) {
        if (controller.signal.aborted || isAbort(error)) return false;
        if (error instanceof TypeError) {
          this.pauseFor('connection', CONNECTION_LOST);
          return false;
        }
        throw error;
      } finally {
        this.inFlight.delete(controller);
      }

      if (response.ok) {
        const sentBytes = this.current.sentBytes + (end - start);
        this.rate.add(this.opts.now(), sentBytes);
        this.update({ sentBytes });
        return true;
      }
      if (response.status === 403) {
        // Most likely the address expired (a long pause, a slow line): ask for a new one.
        this.urls.delete(part);
        if (!renewed) {
          renewed = true;
          continue;
        }
      }
      failures += 1;
      if (failures > this.opts.maxRetries) {
        throw new UploadError(
          `The store refused part ${part} of ${this.partCount} (HTTP ${response.status}) ${failures} times. Try again later: the parts sent so far are kept.`,
        );
      }
      await sleep(this.opts.backoffMs(failures));
    }
  }

  /** A part's address: a known recent one, or a batch asked for with the parts after it. */
  private async urlFor(part: number): Promise<string> {
    const fresh = () => {
      const known = this.urls.get(part);
      return known && this.opts.now() - known.at < URL_REUSE_MS ? known.url : null;
    };
    let url = fresh();
    // One request at a time: parallel senders mostly find their part in the batch just asked for.
    while (!url && this.urlRequest) {
      await this.urlRequest;
      url = fresh();
    }
    if (url) return url;
    this.urlRequest = this.askForUrls(part).finally(() => {
      this.urlRequest = null;
    });
    await this.urlRequest;
    url = fresh();
    if (!url) throw new UploadError(`The server gave no address to send part ${part} to. Try again later.`);
    return url;
  }

  private async askForUrls(first: number): Promise<void> {
    const now = this.opts.now();
    const stale = (n: number) => {
      const known = this.urls.get(n);
      return !known || now - known.at >= URL_REUSE_MS;
    };
    const partNumbers = [first, ...this.queue.filter((n) => n !== first && stale(n))].slice(0, URL_BATCH);
    const { urls } = await archivesApi.partUrls(this.id!, partNumbers);
    const at = this.opts.now();
    for (const u of urls) this.urls.set(u.partNumber, { url: u.url, at });
  }

  /** Waits out a pause; stops the caller once the upload failed or was cancelled. */
  private async whenRunning(): Promise<void> {
    while (this.gate && !this.stopped) await this.gate.promise;
    this.throwIfStopped();
  }

  private throwIfStopped(): void {
    if (this.stopped === 'cancelled') throw new UploadError(CANCELLED);
    if (this.stopped === 'failed') throw new UploadError('The upload stopped.');
  }

  private abortInFlight(): void {
    for (const controller of this.inFlight) controller.abort();
    this.inFlight.clear();
  }

  private sampleRate(): void {
    if (this.current.state !== 'uploading') return;
    this.rate.add(this.opts.now(), this.current.sentBytes);
    this.update({});
  }

  private update(change: Partial<UploadProgress>): void {
    const next = { ...this.current, ...change };
    if (next.state === 'uploading') {
      next.bytesPerSecond = this.rate.perSecond();
      next.secondsLeft = next.bytesPerSecond > 0 ? Math.ceil((next.totalBytes - next.sentBytes) / next.bytesPerSecond) : null;
    }
    if (next.error === undefined) delete next.error;
    this.current = next;
    this.opts.onProgress?.(next);
  }
}

function messageOf(error: unknown): string {
  if (error instanceof UploadError || isApiError(error)) return error.message;
  console.error(error);
  return 'Something went wrong in the portal during the upload. Reload the page and pick the file again to go on.';
}
