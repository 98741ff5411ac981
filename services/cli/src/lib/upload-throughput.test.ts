import { describe, expect, it } from 'vitest';
import { describeProgress } from './upload-progress';
import { BandwidthLimit, formatRate, formatSecondsLeft, TransferRate } from './upload-throughput';

describe('transfer rate', () => {
  it('should be 0 until two samples, then the bytes per second over the window', () => {
    const rate = new TransferRate(5000);
    expect(rate.perSecond()).toBe(0);
    rate.add(0, 0);
    expect(rate.perSecond()).toBe(0);
    rate.add(1000, 8e6);
    expect(rate.perSecond()).toBe(8e6);
    rate.add(2000, 24e6);
    expect(rate.perSecond()).toBe(12e6);
  });

  it('should forget what lies before the window, keeping one anchor sample', () => {
    const rate = new TransferRate(5000);
    rate.add(0, 0);
    rate.add(1000, 100e6); // a burst long ago
    rate.add(10_000, 110e6);
    rate.add(11_000, 120e6);
    // Measured from the anchor just before the window (t = 1 s): 20 MB in 10 s.
    expect(rate.perSecond()).toBe(2e6);
  });
});

describe('bandwidth limit', () => {
  it('should let the first chunk go at once and hold the next ones so the average is the cap', () => {
    let now = 0;
    const limit = new BandwidthLimit(1e6, () => now);
    expect(limit.book(1e6)).toBe(0);
    expect(limit.book(1e6)).toBe(1000);
    expect(limit.book(500_000)).toBe(2000);
    now = 1500;
    expect(limit.book(1e6)).toBe(1000);
  });

  it('should not save up idle time', () => {
    let now = 0;
    const limit = new BandwidthLimit(1e6, () => now);
    limit.book(1e6);
    now = 60_000;
    expect(limit.book(1e6)).toBe(0);
    expect(limit.book(1e6)).toBe(1000);
  });

  it('should refuse a limit that is not a positive number', () => {
    expect(() => new BandwidthLimit(0)).toThrow(RangeError);
    expect(() => new BandwidthLimit(Number.NaN)).toThrow(RangeError);
  });
});

describe('progress text', () => {
  it('should give speeds in MB/s and the time left to the second', () => {
    expect(formatRate(12_345_678)).toBe('12.3 MB/s');
    expect(formatRate(123_456_789)).toBe('123 MB/s');
    expect(formatRate(1_234_567)).toBe('1.23 MB/s');
    expect(formatSecondsLeft(null)).toBe('--');
    expect(formatSecondsLeft(42.4)).toBe('42 s');
    expect(formatSecondsLeft(185)).toBe('3 min 05 s');
    expect(formatSecondsLeft(3720)).toBe('1 h 02 min');
  });

  it('should count the parts in flight as sent and say so while the checksum lags behind', () => {
    const MiB = 1024 ** 2;
    const t = describeProgress({ totalBytes: 40 * MiB, storedBytes: 16 * MiB, inFlightBytes: 4 * MiB, hashedBytes: 10 * MiB }, 2 * MiB);
    expect(t).toEqual({ done: '20.0 MiB of 40.0 MiB', speed: '2.10 MB/s', left: '10 s', hashing: ' | checksum 25 %' });
    expect(describeProgress({ totalBytes: 40 * MiB, storedBytes: 40 * MiB, inFlightBytes: 0, hashedBytes: 40 * MiB }, 0).left).toBe('0 s');
  });
});
