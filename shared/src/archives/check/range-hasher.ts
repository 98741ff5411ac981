import { Worker } from 'node:worker_threads';

/**
 * SHA-256 of byte ranges of a file on this machine, on a thread that reads them by itself into one
 * reused buffer. For a local archive whose entries lie in the file as they are (a plain tar, stored
 * zip entries), the main thread then neither copies nor (for zip) even reads their bytes: it only
 * says where they are.
 */
export class FileRangeHasher {
  private readonly worker: Worker;
  private readonly waiting = new Map<number, { resolve: (hex: string) => void; reject: (error: Error) => void }>();
  private nextId = 0;
  private failure: Error | null = null;

  constructor(path: string) {
    this.worker = new Worker(WORKER_SOURCE, { eval: true, workerData: { path } });
    this.worker.on('message', ({ id, hex, error }: { id: number; hex?: string; error?: string }) => {
      const waiting = this.waiting.get(id);
      this.waiting.delete(id);
      if (hex !== undefined) waiting?.resolve(hex);
      else waiting?.reject(new Error(error));
    });
    this.worker.on('error', (error) => this.fail(error));
    this.worker.on('exit', (code) => this.fail(new Error(`the hashing thread stopped (exit code ${code})`)));
  }

  /** SHA-256 of bytes [start, end) of the file; ranges are hashed in the order asked. */
  hash(start: number, end: number): Promise<string> {
    if (this.failure) return Promise.reject(this.failure);
    const id = this.nextId++;
    const digest = new Promise<string>((resolve, reject) => this.waiting.set(id, { resolve, reject }));
    this.worker.postMessage({ id, start, end });
    return digest;
  }

  close(): void {
    void this.worker.terminate();
  }

  private fail(error: Error): void {
    this.failure ??= error;
    for (const waiting of this.waiting.values()) waiting.reject(this.failure);
    this.waiting.clear();
  }
}

const WORKER_SOURCE = `
const { parentPort, workerData } = require('node:worker_threads');
const { openSync, readSync } = require('node:fs');
const { createHash } = require('node:crypto');
const fd = openSync(workerData.path, 'r');
const buffer = Buffer.allocUnsafe(1024 * 1024);
parentPort.on('message', ({ id, start, end }) => {
  try {
    const hash = createHash('sha256');
    for (let at = start; at < end; ) {
      const read = readSync(fd, buffer, 0, Math.min(buffer.length, end - at), at);
      if (read === 0) throw new Error('the file became shorter while it was checked');
      hash.update(buffer.subarray(0, read));
      at += read;
    }
    parentPort.postMessage({ id, hex: hash.digest('hex') });
  } catch (error) {
    parentPort.postMessage({ id, error: String(error && error.message || error) });
  }
});
`;
