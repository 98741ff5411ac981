/**
 * The speed of an upload, smoothed over a few seconds: parts finish in bursts, several at a time,
 * so the rate between two moments means little.
 */
export class TransferRate {
  private samples: { at: number; bytes: number }[] = [];

  constructor(private readonly windowMs = 5000) {}

  /** The running total of bytes sent at time `at` (ms). */
  add(at: number, bytes: number): void {
    this.samples.push({ at, bytes });
    // Keep the window and the one sample just before it, the anchor the rate is measured from.
    const start = at - this.windowMs;
    let firstInWindow = this.samples.findIndex((s) => s.at >= start);
    if (firstInWindow < 0) firstInWindow = this.samples.length - 1;
    this.samples.splice(0, Math.max(0, firstInWindow - 1));
  }

  /** Bytes per second from the anchor to the latest sample; 0 until there are two. */
  perSecond(): number {
    const first = this.samples[0];
    const last = this.samples[this.samples.length - 1];
    if (!first || last === first || last.at <= first.at) return 0;
    return Math.max(0, ((last.bytes - first.bytes) * 1000) / (last.at - first.at));
  }
}

/**
 * A cap on the bytes per second all parallel senders write together (`--limit-rate`), so an upload
 * from a shared login node leaves room for everyone else on its link. Each sender asks before
 * writing a chunk and waits for its turn; the average over any few seconds stays at the cap.
 */
export class BandwidthLimit {
  private nextFreeAt = 0;

  constructor(
    private readonly bytesPerSecond: number,
    private readonly now: () => number = () => performance.now(),
    private readonly sleep: (ms: number) => Promise<void> = (ms) => new Promise((resolve) => setTimeout(resolve, ms)),
  ) {
    if (!(bytesPerSecond > 0)) throw new RangeError('a bandwidth limit is a positive number of bytes per second');
  }

  /** The wait (ms) before `bytes` may be written, booking the slot; 0 when it may go now. */
  book(bytes: number): number {
    const now = this.now();
    // Idle time is not saved up: after a pause the cap holds from the first chunk on.
    const startAt = Math.max(now, this.nextFreeAt);
    this.nextFreeAt = startAt + (bytes * 1000) / this.bytesPerSecond;
    return startAt - now;
  }

  async take(bytes: number): Promise<void> {
    const wait = this.book(bytes);
    if (wait > 0) await this.sleep(wait);
  }
}

/** "12.3 MB/s": decimal megabytes, as network speeds are given. */
export function formatRate(bytesPerSecond: number): string {
  const mb = bytesPerSecond / 1e6;
  return `${mb >= 100 ? mb.toFixed(0) : mb >= 10 ? mb.toFixed(1) : mb.toFixed(2)} MB/s`;
}

/** "1 h 02 min", "3 min 05 s", "42 s": how long is left, to the second below an hour. */
export function formatSecondsLeft(seconds: number | null): string {
  if (seconds === null || !Number.isFinite(seconds)) return '--';
  const s = Math.max(0, Math.round(seconds));
  if (s >= 3600) return `${Math.floor(s / 3600)} h ${String(Math.floor((s % 3600) / 60)).padStart(2, '0')} min`;
  if (s >= 60) return `${Math.floor(s / 60)} min ${String(s % 60).padStart(2, '0')} s`;
  return `${s} s`;
}
