import { randomBytes } from 'node:crypto';
import { writeFileSync } from 'node:fs';
import { open, type FileHandle } from 'node:fs/promises';
import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { tempConfigDir } from '../../test/cli-harness';
import { putAgents, putPart, storeErrorCode, type PutAgents } from './upload-put';
import { BandwidthLimit } from './upload-throughput';

// One part's PUT against a bare HTTP server: the bytes that arrive, the progress, an answer
// before the body is sent, a connection cut midway, and a part larger than the sender's buffer.

let folder: ReturnType<typeof tempConfigDir>;
let server: Server;
let url: string;
let handler: (req: IncomingMessage, res: ServerResponse) => void;
let file: FileHandle;
let agents: PutAgents;
const bytes = randomBytes(3 * 1024 * 1024 + 17);

beforeEach(async () => {
  folder = tempConfigDir();
  const path = join(folder.dir, 'part.bin');
  writeFileSync(path, bytes);
  file = await open(path, 'r');
  agents = putAgents(2);
  server = createServer((req, res) => handler(req, res));
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const address = server.address();
  url = `http://127.0.0.1:${typeof address === 'object' && address ? address.port : 0}/store/part?X-Signature=abc`;
});
afterEach(async () => {
  agents.destroy();
  await file.close();
  server.closeAllConnections();
  await new Promise<void>((resolve) => server.close(() => resolve()));
  folder.remove();
});

/** Stores what arrives and answers 200, noting the request's method, path and headers. */
function receiving(): { received: () => Buffer; headers: () => IncomingMessage['headers']; method: () => string } {
  let body = Buffer.alloc(0);
  let headers: IncomingMessage['headers'] = {};
  let method = '';
  handler = (req, res) => {
    headers = req.headers;
    method = `${req.method} ${req.url}`;
    const chunks: Buffer[] = [];
    req.on('data', (c: Buffer) => chunks.push(c));
    req.on('end', () => {
      body = Buffer.concat(chunks);
      res.writeHead(200, { etag: '"x"' }).end();
    });
  };
  return { received: () => body, headers: () => headers, method: () => method };
}

describe('putPart', () => {
  it('should PUT the range with its Content-Length and no other header of ours, reporting the bytes written', async () => {
    const server_ = receiving();
    const written: number[] = [];
    const slot = Buffer.alloc(4 * 1024 * 1024);
    const result = await putPart({ url, file, start: 1000, end: bytes.length, slot, agents, signal: new AbortController().signal, onWritten: (n) => written.push(n) });
    expect(result.status).toBe(200);
    expect(result.slotHolds).toEqual({ start: 1000, end: bytes.length });
    expect(server_.method()).toBe('PUT /store/part?X-Signature=abc');
    expect(server_.received().equals(bytes.subarray(1000))).toBe(true);
    expect(server_.headers()['content-length']).toBe(String(bytes.length - 1000));
    expect(server_.headers().authorization).toBeUndefined();
    expect(server_.headers()['content-type']).toBeUndefined();
    expect(written.at(-1)).toBe(bytes.length - 1000);
    expect(written).toEqual([...written].sort((a, b) => a - b));
  });

  it('should send a part larger than its buffer piece by piece, the same bytes', async () => {
    const server_ = receiving();
    const slot = Buffer.alloc(700_000);
    const written: number[] = [];
    const result = await putPart({ url, file, start: 0, end: bytes.length, slot, agents, signal: new AbortController().signal, onWritten: (n) => written.push(n) });
    expect(result.status).toBe(200);
    expect(result.slotHolds).toBeNull();
    expect(server_.received().equals(bytes)).toBe(true);
    expect(written.at(-1)).toBe(bytes.length);
  });

  it('should go at the bandwidth limit', async () => {
    receiving();
    const started = performance.now();
    await putPart({ url, file, start: 0, end: 2 * 1024 * 1024, slot: Buffer.alloc(2 * 1024 * 1024), agents, signal: new AbortController().signal, limit: new BandwidthLimit(4 * 1024 * 1024) });
    // Two chunks of 1 MiB at 4 MiB/s: the second waits 250 ms.
    expect(performance.now() - started).toBeGreaterThan(200);
  });

  it("should stop writing and give the store's answer when it refuses before the body is sent", async () => {
    handler = (req, res) => {
      res.writeHead(403, { 'content-type': 'application/xml', connection: 'close' });
      res.end('<?xml version="1.0"?><Error><Code>AccessDenied</Code><Message>Request has expired</Message></Error>');
      req.resume();
    };
    const result = await putPart({ url, file, start: 0, end: bytes.length, slot: Buffer.alloc(bytes.length), agents, signal: new AbortController().signal });
    expect(result.status).toBe(403);
    expect(storeErrorCode(result.body)).toBe('AccessDenied');
  });

  it('should reject when the connection is cut midway, and when aborted', async () => {
    handler = (req) => {
      let seen = 0;
      req.on('data', (c: Buffer) => {
        seen += c.length;
        if (seen > 100_000) req.socket.destroy();
      });
    };
    await expect(putPart({ url, file, start: 0, end: bytes.length, slot: Buffer.alloc(bytes.length), agents, signal: new AbortController().signal })).rejects.toThrow();

    handler = () => undefined; // never answers
    const controller = new AbortController();
    const pending = putPart({ url, file, start: 0, end: 1000, slot: Buffer.alloc(1000), agents, signal: controller.signal });
    setTimeout(() => controller.abort(new Error('stop')), 50);
    await expect(pending).rejects.toThrow();
  });

  it('should notice a file shorter than planned', async () => {
    receiving();
    await expect(putPart({ url, file, start: bytes.length - 10, end: bytes.length + 10, slot: Buffer.alloc(100), agents, signal: new AbortController().signal })).rejects.toThrow(
      'the file is shorter than when the upload started',
    );
  });
});
