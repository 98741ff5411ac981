/**
 * The speed of a transfer, smoothed over a window of a few seconds: parts finish in bursts
 * (a whole part at a time, several in parallel), so the rate between two events means little.
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

  /** Forgets the history: after a pause the rate starts anew. */
  reset(): void {
    this.samples = [];
  }
}
