import { MessageChannel, Worker, type MessagePort } from 'node:worker_threads';

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
 *
 * Ranges (`{ ranges: true }`, for a thread fed one stream, the whole file): a second thread hashes
 * byte ranges of that stream from the same slots. An entry of a plain tar lies in the file as it is,
 * so its bytes are then copied into shared memory once rather than once per hash. A slot is reused
 * only when both threads are done with it: the range thread keeps what a range asked for still needs,
 * and everything from the floor on, since a range asked for later may begin there. Ranges are asked
 * for in order and may not begin below the floor; when the ring is full the floor moves up to free
 * half of it, and a range below it is refused (its caller hashes those bytes another way).
 */
export class HashThread {
  private readonly shared: SharedArrayBuffer;
  private readonly control: Int32Array;
  /** Where each slot's bytes begin in the stream (ranges need it; partly filled slots end streams). */
  private readonly slotStarts: Float64Array;
  private readonly slots: Buffer;
  private readonly worker: Worker;
  private readonly digests: { resolve: (hex: string) => void; reject: (error: Error) => void }[] = [];
  private published = 0;
  private filled = 0; // bytes in the slot being filled
  private written = 0; // bytes taken so far: the stream offset of the next one
  private closed = false;
  private failure: Error | null = null;
  /** Operations waiting for room, in order: a new one may not overtake them. */
  private queue: Promise<void> = Promise.resolve();
  private queued = 0;

  private readonly rangesEnabled: boolean;
  private rangeWorker: Worker | null = null;
  private rangePort: MessagePort | null = null;
  private readonly rangeWaits = new Map<number, { resolve: (hex: string) => void; reject: (error: Error) => void }>();
  private readonly rangesPending = new Set<Promise<void>>();
  private nextRangeId = 0;
  /** No range asked for from now on may begin below this stream offset. */
  private floor = 0;
  /** Slots the range side no longer needs, counted here until its thread starts (then the thread counts). */
  private releasedBeforeRanges = 0;

  constructor(options: { ranges?: boolean } = {}) {
    this.rangesEnabled = options.ranges === true;
    this.shared = new SharedArrayBuffer(DATA_AT + SLOT_COUNT * SLOT_BYTES);
    this.control = new Int32Array(this.shared, 0, CONTROL_WORDS + 2 * SLOT_COUNT);
    this.slotStarts = new Float64Array(this.shared, STARTS_AT, SLOT_COUNT);
    // A Buffer view: Buffer#copy is a plain memmove, where TypedArray#set into shared memory may not be.
    this.slots = Buffer.from(this.shared, DATA_AT);
    this.worker = new Worker(WORKER_SOURCE, { eval: true, workerData: { shared: this.shared } });
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

  /**
   * The SHA-256 of stream bytes [start, end), hashed on the range thread (started at the first range)
   * from the slots as they fill; null when the range begins below the floor (its first bytes may be
   * gone), and then the caller hashes it another way. Only with `{ ranges: true }`.
   */
  hashRange(start: number, end: number): Promise<string> | null {
    if (!this.rangesEnabled) throw new Error('this hash thread was made without ranges');
    if (this.closed || start < this.floor || end < start) return null;
    if (this.failure) return Promise.reject(this.failure);
    // Started (from what is released so far) before the floor moves past this range's bytes.
    const port = this.rangeThread();
    // Later ranges begin at the end of this one or after: what lies before it need not be kept.
    this.floor = end;
    const id = this.nextRangeId++;
    const digest = new Promise<string>((resolve, reject) => this.rangeWaits.set(id, { resolve, reject }));
    const settled = digest.then(
      () => undefined,
      () => undefined,
    );
    this.rangesPending.add(settled);
    void settled.then(() => this.rangesPending.delete(settled));
    port.postMessage({ id, start, end });
    this.wakeRangeThread();
    return digest;
  }

  /** Resolves once every range asked for so far has its digest or has failed (the range's own promise says which). */
  async rangesSettled(): Promise<void> {
    await Promise.all([...this.rangesPending]);
  }

  /** Stop the threads (at the end, or when the check stops early). */
  close(): void {
    if (this.closed) return;
    this.closed = true;
    void this.worker.terminate();
    if (this.rangeWorker) void this.rangeWorker.terminate();
    this.rangePort?.close();
  }

  private fail(error: Error): void {
    this.failure ??= error;
    for (const waiting of this.digests.splice(0)) waiting.reject(this.failure);
    for (const waiting of this.rangeWaits.values()) waiting.reject(this.failure);
    this.rangeWaits.clear();
    // A main thread waiting for room learns of it now rather than at its next timeout.
    Atomics.add(this.control, RELEASES, 1);
    Atomics.notify(this.control, RELEASES);
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

  /** Slots both sides are done with (a running count): the file's thread and, with ranges, the range side. */
  private released(): number {
    const consumed = Atomics.load(this.control, CONSUMED);
    if (!this.rangesEnabled) return consumed;
    if (this.rangeWorker) return Math.min(consumed, Atomics.load(this.control, RANGE_RELEASED));
    // No range asked for yet: nothing before the floor is needed.
    while (this.releasedBeforeRanges < this.published && this.slotEnd(this.releasedBeforeRanges) <= this.floor) this.releasedBeforeRanges++;
    return Math.min(consumed, this.releasedBeforeRanges);
  }

  /** The stream offset just past published slot `n` (still in the ring). */
  private slotEnd(n: number): number {
    const slot = n % SLOT_COUNT;
    return this.slotStarts[slot] + this.control[CONTROL_WORDS + slot];
  }

  /** Bytes the ring can take now: the free slots, less what the slot being filled holds already. */
  private room_(): number {
    return (SLOT_COUNT - (this.published - this.released())) * SLOT_BYTES - this.filled;
  }

  /** Copies bytes[from, to) into the ring, publishing each slot it fills; they must fit. Returns `to`. */
  private copyIn(bytes: Buffer, from = 0, to = bytes.length): number {
    let at = from;
    while (at < to) {
      const take = Math.min(SLOT_BYTES - this.filled, to - at);
      bytes.copy(this.slots, (this.published % SLOT_COUNT) * SLOT_BYTES + this.filled, at, at + take);
      this.filled += take;
      this.written += take;
      at += take;
      if (this.filled === SLOT_BYTES) this.publish(false);
    }
    return to;
  }

  private publish(endOfStream: boolean): void {
    const { control } = this;
    const slot = this.published % SLOT_COUNT;
    control[CONTROL_WORDS + slot] = this.filled;
    control[CONTROL_WORDS + SLOT_COUNT + slot] = endOfStream ? 1 : 0;
    this.slotStarts[slot] = this.written - this.filled;
    this.published++;
    this.filled = 0;
    if (endOfStream) Atomics.store(control, ENDED_AT, this.published);
    Atomics.store(control, PUBLISHED, this.published);
    Atomics.add(control, GENERATION, 1);
    // A sleeping worker is woken for a batch of slots or a stream's end, not for each slot: a wake-up is a system call.
    const fileWants = Atomics.load(control, WORKER_SLEEPS) === 1 && (endOfStream || this.published - Atomics.load(control, CONSUMED) >= WAKE_BATCH);
    // The range thread only when a range waits for bytes (when idle it has nothing to do with them).
    const rangesWant =
      this.rangeWaits.size > 0 && Atomics.load(control, RANGE_SLEEPS) === 1 && (endOfStream || this.published - Atomics.load(control, RANGE_RELEASED) >= WAKE_BATCH);
    if (fileWants || rangesWant) Atomics.notify(control, GENERATION);
  }

  /**
   * Resolves when the slot to fill next is free. When the ring is full it waits until half of it is
   * free, so that the worker wakes the main thread once per half ring rather than once per slot.
   */
  private async room(): Promise<void> {
    const { control } = this;
    if (this.published - this.released() < SLOT_COUNT) return;
    const wanted = this.published - SLOT_COUNT / 2; // the released count to wait for
    // The range side may hold slots only for ranges not yet asked for: let those go.
    if (this.rangesEnabled) this.raiseFloor(this.slotEnd(wanted - 1));
    while (!this.closed && this.failure === null) {
      Atomics.store(control, MAIN_WAITS, wanted);
      const releases = Atomics.load(control, RELEASES);
      if (this.released() >= wanted) break;
      if (waitAsync) {
        const wait = waitAsync(control, RELEASES, releases, 1000);
        if (wait.async) await wait.value;
      } else {
        await new Promise((resolve) => setTimeout(resolve, 1));
      }
    }
    Atomics.store(control, MAIN_WAITS, 0);
    if (this.failure) throw this.failure;
  }

  private raiseFloor(offset: number): void {
    if (offset <= this.floor) return;
    this.floor = offset;
    if (!this.rangePort) return;
    this.rangePort.postMessage({ floor: offset });
    this.wakeRangeThread();
  }

  private rangeThread(): MessagePort {
    if (this.rangePort) return this.rangePort;
    const { port1, port2 } = new MessageChannel();
    // The thread goes on from what was counted here (nothing at or past the floor, so none of the
    // first range's bytes); its own floor comes with that range's message.
    Atomics.store(this.control, RANGE_RELEASED, this.released());
    const worker = new Worker(RANGE_WORKER_SOURCE, { eval: true, workerData: { shared: this.shared, port: port2 }, transferList: [port2] });
    worker.on('message', ({ id, hex, error }: { id: number; hex?: string; error?: string }) => {
      const waiting = this.rangeWaits.get(id);
      this.rangeWaits.delete(id);
      if (hex !== undefined) waiting?.resolve(hex);
      else waiting?.reject(new Error(error));
    });
    worker.on('error', (error) => this.fail(error));
    worker.on('exit', (code) => this.fail(new Error(`the range hashing thread stopped (exit code ${code})`)));
    this.rangeWorker = worker;
    this.rangePort = port1;
    return port1;
  }

  /** After a message: the range thread reads its port when it wakes. */
  private wakeRangeThread(): void {
    Atomics.add(this.control, GENERATION, 1);
    if (Atomics.load(this.control, RANGE_SLEEPS) === 1) Atomics.notify(this.control, GENERATION);
  }
}

const SLOT_BYTES = 1024 * 1024;
const SLOT_COUNT = 16;
const WAKE_BATCH = 4;

// Control words (Int32) at the start of the shared buffer; then slot lengths, slot flags, slot starts (Float64), the slots.
const PUBLISHED = 0; // slots published by the main thread (a running count)
const CONSUMED = 1; // slots hashed by the file's worker (a running count)
const GENERATION = 2; // bumped at every publish and every message to the range thread; the workers sleep on it
const WORKER_SLEEPS = 3;
const MAIN_WAITS = 4; // the released count the main thread waits for (0: it does not wait)
const RELEASES = 5; // bumped when a worker frees what the main thread waits for; the main thread waits on it
const RANGE_RELEASED = 6; // slots the range thread no longer needs (a running count)
const RANGE_SLEEPS = 7;
const ENDED_AT = 8; // the published count when the last stream ended (0: none yet)
const CONTROL_WORDS = 12;
const STARTS_AT = (CONTROL_WORDS + 2 * SLOT_COUNT) * 4; // a multiple of 8, as Float64Array wants
const DATA_AT = STARTS_AT + SLOT_COUNT * 8;

type WaitAsync = (typed: Int32Array, index: number, value: number, timeout?: number) => { async: boolean; value: Promise<string> | string };
const waitAsync = (Atomics as unknown as { waitAsync?: WaitAsync }).waitAsync;

/** Plain JavaScript, evaluated: it runs the same under tsx, vitest and a compiled build (no file to locate). */
const WORKER_SOURCE = `
const { parentPort, workerData } = require('node:worker_threads');
const { createHash } = require('node:crypto');
const SLOT_BYTES = ${SLOT_BYTES}, SLOT_COUNT = ${SLOT_COUNT}, CONTROL_WORDS = ${CONTROL_WORDS};
const control = new Int32Array(workerData.shared, 0, CONTROL_WORDS + 2 * SLOT_COUNT);
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
  if (length > 0) hash.update(new Uint8Array(workerData.shared, ${DATA_AT} + slot * SLOT_BYTES, length));
  const endOfStream = control[CONTROL_WORDS + SLOT_COUNT + slot] === 1;
  consumed++;
  Atomics.store(control, ${CONSUMED}, consumed);
  const wanted = Atomics.load(control, ${MAIN_WAITS});
  if (wanted !== 0 && consumed >= wanted) {
    Atomics.add(control, ${RELEASES}, 1);
    Atomics.notify(control, ${RELEASES});
  }
  if (endOfStream) {
    parentPort.postMessage(hash.digest('hex'));
    hash = createHash('sha256');
  }
}
`;

/**
 * The range thread: ranges ({ id, start, end }) and floors ({ floor }) come in order through its
 * port; it hashes each range from the published slots and frees a slot once no range asked for, nor
 * any that may still be asked for (none begins below the floor), needs it.
 */
const RANGE_WORKER_SOURCE = `
const { parentPort, workerData, receiveMessageOnPort } = require('node:worker_threads');
const { createHash } = require('node:crypto');
const SLOT_BYTES = ${SLOT_BYTES}, SLOT_COUNT = ${SLOT_COUNT}, CONTROL_WORDS = ${CONTROL_WORDS};
const { shared, port } = workerData;
const control = new Int32Array(shared, 0, CONTROL_WORDS + 2 * SLOT_COUNT);
const starts = new Float64Array(shared, ${STARTS_AT}, SLOT_COUNT);
const ranges = []; // asked for, in order: { id, at, end, hash }
let floor = 0; // no range not yet received begins below this
let released = Atomics.load(control, ${RANGE_RELEASED});
const slotEnd = (n) => starts[n % SLOT_COUNT] + control[CONTROL_WORDS + (n % SLOT_COUNT)];

function receive() {
  let got = false;
  for (let m; (m = receiveMessageOnPort(port)); got = true) {
    const { id, start, end, floor: at } = m.message;
    if (id === undefined) floor = Math.max(floor, at);
    else {
      ranges.push({ id, at: start, end, hash: createHash('sha256') });
      floor = Math.max(floor, end);
    }
  }
  return got;
}

function settle(error) {
  const range = ranges.shift();
  parentPort.postMessage(error ? { id: range.id, error } : { id: range.id, hex: range.hash.digest('hex') });
}

/** Frees the slots before the first byte still needed; wakes the main thread if it waits for them. */
function release(published) {
  const needed = ranges.length > 0 ? ranges[0].at : floor;
  let free = released;
  while (free < published && slotEnd(free) <= needed) free++;
  if (free === released) return false;
  released = free;
  Atomics.store(control, ${RANGE_RELEASED}, released);
  const wanted = Atomics.load(control, ${MAIN_WAITS});
  if (wanted !== 0 && released >= wanted) {
    Atomics.add(control, ${RELEASES}, 1);
    Atomics.notify(control, ${RELEASES});
  }
  return true;
}

for (;;) {
  receive();
  const published = Atomics.load(control, ${PUBLISHED});
  let worked = false;
  while (ranges.length > 0) {
    const range = ranges[0];
    if (range.at >= range.end) {
      settle();
      worked = true;
      continue;
    }
    // Only slots from 'released' on are sure to hold what they held when published.
    let n = released;
    while (n < published && slotEnd(n) <= range.at) n++;
    if (n >= published) {
      const endedAt = Atomics.load(control, ${ENDED_AT});
      if (endedAt === 0 || published < endedAt) break;
      settle('the range ends after the stream');
      worked = true;
      continue;
    }
    const slot = n % SLOT_COUNT;
    const start = starts[slot];
    if (range.at < start) {
      settle('the range begins before the bytes kept'); // never, while ranges come in order above the floor
      worked = true;
      continue;
    }
    const to = Math.min(control[CONTROL_WORDS + slot], range.end - start);
    range.hash.update(new Uint8Array(shared, ${DATA_AT} + slot * SLOT_BYTES + (range.at - start), to - (range.at - start)));
    range.at = start + to;
    worked = true;
    release(published);
  }
  if (release(published) || worked) continue;
  Atomics.store(control, ${RANGE_SLEEPS}, 1);
  const generation = Atomics.load(control, ${GENERATION});
  if (!receive() && Atomics.load(control, ${PUBLISHED}) === published) Atomics.wait(control, ${GENERATION}, generation);
  Atomics.store(control, ${RANGE_SLEEPS}, 0);
}
`;
