import { SingleBar } from 'cli-progress';
import { formatSize } from './upload-format';
import { formatRate, formatSecondsLeft, TransferRate } from './upload-throughput';

/** Where an upload stands, in bytes. */
export interface UploadCounters {
  totalBytes: number;
  /** In the store: parts stored before this run and parts sent by it. */
  storedBytes: number;
  /** Written so far of the parts in flight. */
  inFlightBytes: number;
  /** Read into the SHA-256 (the whole file is read, stored parts included). */
  hashedBytes: number;
}

/** How the upload shows its progress on stderr: a bar on a terminal, a plain line now and then into a log. */
export interface ProgressView {
  update(counters: UploadCounters): void;
  /** A message that must not be drawn over (a retry, a notice). */
  note(text: string): void;
  stop(): void;
}

/** Into a pipe or a batch job's log: a line this often, not a redraw per chunk. */
export const PLAIN_LINE_EVERY_MS = 5000;

/** The text after the bar, or the plain line: sent, speed, time left, and the checksum while it lags. */
export function describeProgress(c: UploadCounters, bytesPerSecond: number): { done: string; speed: string; left: string; hashing: string } {
  const sent = Math.min(c.totalBytes, c.storedBytes + c.inFlightBytes);
  // The checksum must have read the whole file too; when it is the slower of the two, it sets the time left.
  const secondsToSend = bytesPerSecond > 0 ? (c.totalBytes - sent) / bytesPerSecond : null;
  const hashingBehind = c.hashedBytes < c.totalBytes && c.hashedBytes < sent;
  return {
    done: `${formatSize(sent)} of ${formatSize(c.totalBytes)}`,
    speed: formatRate(bytesPerSecond),
    left: formatSecondsLeft(sent >= c.totalBytes ? 0 : secondsToSend),
    hashing: hashingBehind ? ` | checksum ${Math.floor((100 * c.hashedBytes) / c.totalBytes)} %` : '',
  };
}

export function progressView(stderr: NodeJS.WriteStream, now: () => number = Date.now): ProgressView {
  const rate = new TransferRate(5000);
  const sentOf = (c: UploadCounters) => Math.min(c.totalBytes, c.storedBytes + c.inFlightBytes);
  // Only bytes sent by this run count for the speed: stored parts found at the start are not a speed.
  let firstSent: number | null = null;

  if (stderr.isTTY) {
    const bar = new SingleBar(
      {
        stream: stderr,
        format: '{bar} {percentage}% | {done} | {speed} | {left} left{hashing}',
        barsize: 28,
        hideCursor: true,
        clearOnComplete: true,
        gracefulExit: false,
        fps: 5,
        linewrap: false,
      },
      { format: '', barCompleteChar: '\u2588', barIncompleteChar: '\u2591' },
    );
    let started = false;
    return {
      update(c) {
        firstSent ??= sentOf(c);
        rate.add(now(), sentOf(c) - firstSent);
        const text = describeProgress(c, rate.perSecond());
        if (!started) {
          bar.start(c.totalBytes, sentOf(c), text);
          started = true;
        } else {
          bar.update(sentOf(c), text);
        }
      },
      note(text) {
        stderr.write(`\r\x1b[Klocalis: ${text}\n`);
      },
      stop() {
        if (started) bar.stop();
        started = false;
      },
    };
  }

  let lastLineAt = now();
  return {
    update(c) {
      firstSent ??= sentOf(c);
      rate.add(now(), sentOf(c) - firstSent);
      if (now() - lastLineAt < PLAIN_LINE_EVERY_MS) return;
      lastLineAt = now();
      const t = describeProgress(c, rate.perSecond());
      const percent = Math.floor((100 * sentOf(c)) / c.totalBytes);
      stderr.write(`localis: ${t.done} sent (${percent} %), ${t.speed}, ${t.left} left${t.hashing.replace(' | ', ', ')}\n`);
    },
    note(text) {
      stderr.write(`localis: ${text}\n`);
    },
    stop() {},
  };
}
