import { describe, expect, it } from 'vitest';
import { KernelThreadFailure, startTransferMatrixThread } from './kernel-thread';
import { runTransferMatrix, TransferMatrixCancelled, type TransferMatrixProgress } from './transfer-matrix';

describe('the kernel on its own thread', () => {
  it('should give exactly what the kernel gives on this thread for the same seed', async () => {
    const input = { dimension: 3, width: 4, disorder: 16.5, precision: 0.03, seed: 11 } as const;
    const threaded = await startTransferMatrixThread(input).result;
    const here = runTransferMatrix(input);
    expect({ ...threaded, seconds: 0 }).toEqual({ ...here, seconds: 0 });
  });

  it('should report progress while it runs', async () => {
    const seen: TransferMatrixProgress[] = [];
    const run = startTransferMatrixThread({ dimension: 2, width: 16, disorder: 6, slices: 200_000, seed: 3 }, { onProgress: (p) => seen.push(p), progressIntervalMs: 0 });
    const result = await run.result;
    expect(seen.length).toBeGreaterThan(1);
    expect(seen.map((p) => p.slices)).toEqual([...seen.map((p) => p.slices)].sort((a, b) => a - b));
    expect(seen.at(-1)!.slices).toBeLessThanOrEqual(result.slices);
    expect(run.slicesDone).toBe(seen.at(-1)!.slices);
  });

  it('should stop when cancelled and say after how many slices', async () => {
    const run = startTransferMatrixThread({ dimension: 3, width: 8, disorder: 16.5, slices: 50_000_000, seed: 1, allowLong: true }, { onProgress: () => undefined, progressIntervalMs: 0 });
    await new Promise((r) => setTimeout(r, 300));
    run.cancel();
    const error = await run.result.catch((e: unknown) => e);
    expect(error).toBeInstanceOf(TransferMatrixCancelled);
    expect((error as TransferMatrixCancelled).slices).toBeGreaterThan(0);
  });

  it('should pass on the kernel’s refusal as a failure, not a crash', async () => {
    const error = await startTransferMatrixThread({ dimension: 3, width: 40, disorder: 16.5, precision: 1e-4, seed: 1 }).result.catch((e: unknown) => e);
    expect(error).toBeInstanceOf(KernelThreadFailure);
    expect((error as Error).message).toMatch(/allowLong/);
  });
});
