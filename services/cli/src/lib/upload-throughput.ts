/** The smoothed speed is shared with the portal's uploader. */
export { TransferRate } from '@localis/shared';

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
