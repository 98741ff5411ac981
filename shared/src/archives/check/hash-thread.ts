import { Worker } from 'node:worker_threads';

/**
 * SHA-256 on a worker thread, fed through shared memory: a sequence of byte streams (the whole
 * file, or one entry after another), each ending in a digest.
 *
 * Verifying an archive hashes every byte twice: once as part of the file (to compare with what the
 * uploader declared) and once inside its entry (to compare with the manifest). SHA-256 cannot share
 * work between the two, since an entry's hash starts from the initial state at the entry's first
 * byte; on one thread that is twice the time of `openssl dgst`. So the hashing runs on threads of
 * its own while the main thread reads and unpacks: the main thread copies each chunk into a ring of
 * slots in shared memory (one memcpy, no allocation, no structured clone) and moves on; the worker
 * hashes the slots in order. The two sides meet through Atomics: the worker sleeps on a generation
 * counter when it has caught up, the main thread waits (asynchronously) only when every slot is
 * full, and each side wakes the other only when it sleeps.
 */
export class HashThread {
  private readonly control: Int32Array;
  private readonly slots: Buffer;
  private readonly worker: Worker;
  private readonly digests: { resolve: (hex: string) => void; reject: (error: Error) => void }[] = [];
  private published = 0;
  private filled = 0; // bytes in the slot being filled
  private closed = false;
  private failure: Error | null = null;
  /** Operations waiting for room, in order: a new one may not overtake them. */
  private queue: Promise<void> = Promise.resolve();
  private queued = 0;

  constructor() {
    const controlBytes = (CONTROL_WORDS + 2 * SLOT_COUNT) * 4;
    const shared = new SharedArrayBuffer(controlBytes + SLOT_COUNT * SLOT_BYTES);
    this.control = new Int32Array(shared, 0, CONTROL_WORDS + 2 * SLOT_COUNT);
    // A Buffer view: Buffer#copy is a plain memmove, where TypedArray#set into shared memory may not be.
    this.slots = Buffer.from(shared, controlBytes);
    this.worker = new Worker(WORKER_SOURCE, { eval: true, workerData: { shared } });
    this.worker.on('message', (hex: string) => this.digests.shift()?.resolve(hex));
    this.worker.on('error', (error) => this.fail(error));
    this.worker.on('exit', (code) => this.fail(new Error(`the hashing thread stopped (exit code ${code})`)));
  }

  /** Hash these bytes next, in the current stream; the promise, when there is one, resolves once they are taken. */
  update(chunk: Uint8Array): Promise<void> | void {
    if (this.closed) return;
    const bytes = Buffer.isBuffer(chunk) ? chunk : Buffer.from(chunk.buffer, chunk.byteOffset, chunk.byteLength);
    // The common case stays synchronous, without a promise per chunk: the ring has room for it all.
    if (this.queued === 0 && bytes.length <= this.room_()) {
      this.copyIn(bytes);
      return;
    }
    return this.enqueue(() => this.write(bytes));
  }

  /** Ends the current stream: its digest. The next update begins a new stream. */
  endStream(): Promise<string> {
    if (this.failure) return Promise.reject(this.failure);
    const digest = new Promise<string>((resolve, reject) => this.digests.push({ resolve, reject }));
    this.enqueue(async () => {
      await this.room();
      this.publish(true);
    }).catch(() => undefined); // the digest's promise carries the failure
    return digest;
  }

  /** Stop the thread (at the end, or when the check stops early). */
  close(): void {
    if (this.closed) return;
    this.closed = true;
    void this.worker.terminate();
  }

  private fail(error: Error): void {
    this.failure ??= error;
    for (const waiting of this.digests.splice(0)) waiting.reject(this.failure);
  }

  private enqueue(operation: () => Promise<void>): Promise<void> {
    this.queued++;
    const run = this.queue.then(operation).finally(() => this.queued--);
    this.queue = run.catch(() => undefined);
    return run;
  }

  private async write(bytes: Buffer): Promise<void> {
    let at = 0;
    while (at < bytes.length && !this.closed) {
      if (this.filled === 0) await this.room();
      at = this.copyIn(bytes, at, Math.min(bytes.length, at + this.room_()));
    }
  }

  /** Bytes the ring can take now: the free slots, less what the slot being filled holds already. */
  private room_(): number {
    return (SLOT_COUNT - (this.published - Atomics.load(this.control, CONSUMED))) * SLOT_BYTES - this.filled;
  }

  /** Copies bytes[from, to) into the ring, publishing each slot it fills; they must fit. Returns `to`. */
  private copyIn(bytes: Buffer, from = 0, to = bytes.length): number {
    let at = from;
    while (at < to) {
      const take = Math.min(SLOT_BYTES - this.filled, to - at);
      bytes.copy(this.slots, (this.published % SLOT_COUNT) * SLOT_BYTES + this.filled, at, at + take);
      this.filled += take;
      at += take;
      if (this.filled === SLOT_BYTES) this.publish(false);
    }
    return to;
  }

  private publish(endOfStream: boolean): void {
    const slot = this.published % SLOT_COUNT;
    this.control[CONTROL_WORDS + slot] = this.filled;
    this.control[CONTROL_WORDS + SLOT_COUNT + slot] = endOfStream ? 1 : 0;
    this.published++;
    this.filled = 0;
    Atomics.store(this.control, PUBLISHED, this.published);
    Atomics.add(this.control, GENERATION, 1);
    // A sleeping worker is woken for a batch of slots or a stream's end, not for each slot: a wake-up is a system call.
    if (Atomics.load(this.control, WORKER_SLEEPS) === 1 && (endOfStream || this.published - Atomics.load(this.control, CONSUMED) >= WAKE_BATCH)) {
      Atomics.notify(this.control, GENERATION);
    }
  }

  /**
   * Resolves when the slot to fill next is free. When the ring is full it waits until half of it is
   * free, so that the worker wakes the main thread once per half ring rather than once per slot.
   */
  private async room(): Promise<void> {
    const { control } = this;
    if (this.published - Atomics.load(control, CONSUMED) < SLOT_COUNT) return;
    const wanted = this.published - SLOT_COUNT / 2; // the consumed count to wait for
    while (!this.closed && this.failure === null) {
      Atomics.store(control, MAIN_WAITS, wanted);
      const consumed = Atomics.load(control, CONSUMED);
      if (consumed >= wanted) break;
      if (waitAsync) {
        const wait = waitAsync(control, CONSUMED, consumed, 1000);
        if (wait.async) await wait.value;
      } else {
        await new Promise((resolve) => setTimeout(resolve, 1));
      }
    }
    Atomics.store(control, MAIN_WAITS, 0);
    if (this.failure) throw this.failure;
  }
}

const SLOT_BYTES = 1024 * 1024;
const SLOT_COUNT = 16;
const WAKE_BATCH = 4;

// Control words (Int32) at the start of the shared buffer; then slot lengths, then slot flags.
const PUBLISHED = 0; // slots published by the main thread (a running count)
const CONSUMED = 1; // slots hashed by the worker (a running count)
const GENERATION = 2; // bumped at every publish; the worker sleeps on it
const WORKER_SLEEPS = 3;
const MAIN_WAITS = 4; // the consumed count the main thread waits for (0: it does not wait)
const CONTROL_WORDS = 8;

type WaitAsync = (typed: Int32Array, index: number, value: number, timeout?: number) => { async: boolean; value: Promise<string> | string };
const waitAsync = (Atomics as unknown as { waitAsync?: WaitAsync }).waitAsync;

/** Plain JavaScript, evaluated: it runs the same under tsx, vitest and a compiled build (no file to locate). */
const WORKER_SOURCE = `
const { parentPort, workerData } = require('node:worker_threads');
const { createHash } = require('node:crypto');
const SLOT_BYTES = ${SLOT_BYTES}, SLOT_COUNT = ${SLOT_COUNT}, CONTROL_WORDS = ${CONTROL_WORDS};
const control = new Int32Array(workerData.shared, 0, CONTROL_WORDS + 2 * SLOT_COUNT);
const dataStart = (CONTROL_WORDS + 2 * SLOT_COUNT) * 4;
let hash = createHash('sha256');
let consumed = 0;
for (;;) {
  if (Atomics.load(control, ${PUBLISHED}) === consumed) {
    Atomics.store(control, ${WORKER_SLEEPS}, 1);
    const generation = Atomics.load(control, ${GENERATION});
    if (Atomics.load(control, ${PUBLISHED}) === consumed) Atomics.wait(control, ${GENERATION}, generation);
    Atomics.store(control, ${WORKER_SLEEPS}, 0);
    continue;
  }
  const slot = consumed % SLOT_COUNT;
  const length = control[CONTROL_WORDS + slot];
  if (length > 0) hash.update(new Uint8Array(workerData.shared, dataStart + slot * SLOT_BYTES, length));
  const endOfStream = control[CONTROL_WORDS + SLOT_COUNT + slot] === 1;
  consumed++;
  Atomics.store(control, ${CONSUMED}, consumed);
  const wanted = Atomics.load(control, ${MAIN_WAITS});
  if (wanted !== 0 && consumed >= wanted) Atomics.notify(control, ${CONSUMED});
  if (endOfStream) {
    parentPort.postMessage(hash.digest('hex'));
    hash = createHash('sha256');
  }
}
`;
