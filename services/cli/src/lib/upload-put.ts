import type { FileHandle } from 'node:fs/promises';
import { once } from 'node:events';
import { request as httpRequest, Agent as HttpAgent, type ClientRequest, type IncomingMessage } from 'node:http';
import { request as httpsRequest, Agent as HttpsAgent } from 'node:https';
import type { BandwidthLimit } from './upload-throughput';

/**
 * One part PUT to a presigned address, read from the file into a buffer owned by the sender, and
 * written to the socket a chunk at a time: memory stays at one buffer per part in flight whatever
 * the file's size, the progress moves as bytes leave (not a whole part at once), and a bandwidth
 * limit can hold each chunk back. Plain node:http rather than fetch, for those three.
 */

/** Bytes written to the socket at a time: the step of the progress and of the bandwidth limit. */
export const WRITE_CHUNK_BYTES = 1024 * 1024;
/** A buffer at most this large per part in flight; larger parts (files over ~80 GiB) are read in pieces. */
export const MAX_SLOT_BYTES = 16 * 1024 * 1024;
/** A store that accepts no byte for this long is given up on (and the part tried again). */
export const SOCKET_IDLE_MS = 120_000;

export interface PutAgents {
  http: HttpAgent;
  https: HttpsAgent;
  destroy(): void;
}

/** Kept-alive connections, as many as parts go in parallel. Destroyed at the end, or Node would wait on them. */
export function putAgents(parallel: number): PutAgents {
  const http = new HttpAgent({ keepAlive: true, maxSockets: parallel });
  const https = new HttpsAgent({ keepAlive: true, maxSockets: parallel });
  return {
    http,
    https,
    destroy() {
      http.destroy();
      https.destroy();
    },
  };
}

export interface PutPartInput {
  url: string;
  file: FileHandle;
  /** Byte range [start, end) of the file. */
  start: number;
  end: number;
  /** This sender's buffer, reused part after part. */
  slot: Buffer;
  /** Set when `slot` holds this very range already (a retry after reading it once). */
  slotHolds?: { start: number; end: number } | null;
  agents: PutAgents;
  signal: AbortSignal;
  limit?: BandwidthLimit;
  /** Bytes of this attempt written to the socket so far (a retry starts again at 0). */
  onWritten?: (bytesOfThisPart: number) => void;
}

export interface PutPartResult {
  status: number;
  /** The start of the store's answer when it refused, for the message. */
  body: string;
  /** The range the slot holds after this call (so a retry need not read the file again). */
  slotHolds: { start: number; end: number } | null;
}

/** The file changed under us: its bytes are not the ones the upload was planned for. */
export class FileChangedError extends Error {
  override name = 'FileChangedError';
}

/** Fills `buffer[0, length)` from the file at `position`; throws if the file is shorter now. */
async function readExactly(file: FileHandle, buffer: Buffer, length: number, position: number): Promise<void> {
  let done = 0;
  while (done < length) {
    const { bytesRead } = await file.read(buffer, done, length - done, position + done);
    if (bytesRead === 0) throw new FileChangedError('the file is shorter than when the upload started');
    done += bytesRead;
  }
}

/**
 * PUT bytes [start, end) of the file to `url` with a Content-Length and no other header the
 * presigned signature does not cover. Resolves with the store's status; rejects on a network
 * error, a stalled socket or an abort.
 */
export async function putPart(input: PutPartInput): Promise<PutPartResult> {
  const { url, file, start, end, slot, agents, signal, limit, onWritten } = input;
  const length = end - start;
  const target = new URL(url);
  const secure = target.protocol === 'https:';
  const whole = length <= slot.length;
  let slotHolds = input.slotHolds ?? null;
  if (whole && !(slotHolds && slotHolds.start === start && slotHolds.end === end)) {
    slotHolds = null;
    await readExactly(file, slot, length, start);
    slotHolds = { start, end };
  }
  signal.throwIfAborted();

  const req = (secure ? httpsRequest : httpRequest)(target, {
    method: 'PUT',
    headers: { 'content-length': String(length) },
    agent: secure ? agents.https : agents.http,
    signal,
  });
  // The first error settles the exchange below; a later one (a socket dying twice) must not crash the process.
  req.on('error', () => undefined);
  req.setTimeout(SOCKET_IDLE_MS, () => req.destroy(new Error(`the store accepted nothing for ${SOCKET_IDLE_MS / 1000} s`)));

  const answered = new Promise<IncomingMessage>((resolve, reject) => {
    req.once('response', resolve);
    req.once('error', reject);
  });
  // Anything that ends the exchange early (an answer before the body is done, e.g. 403 on an
  // expired address; an error; a closed socket): stop writing and stop waiting for the socket.
  let over = false;
  const ended = new Promise<void>((resolve) => {
    const stop = () => {
      over = true;
      resolve();
    };
    answered.then(stop, stop);
    req.once('close', stop);
  });
  const untilOver = (promise: Promise<unknown>) => Promise.race([promise, ended]);

  try {
    if (whole) {
      await writeChunks(req, slot, 0, length, limit, onWritten, 0, () => over, untilOver);
    } else {
      // A part larger than the buffer is read piece by piece; a piece must have left the buffer
      // (written to the socket) before the next is read into it.
      for (let offset = 0; offset < length && !over; offset += slot.length) {
        const pieceLength = Math.min(slot.length, length - offset);
        await readExactly(file, slot, pieceLength, start + offset);
        await writeChunks(req, slot, 0, pieceLength, limit, onWritten, offset, () => over, untilOver);
      }
    }
    if (!over) req.end();
  } catch (error) {
    req.destroy(error as Error);
  }

  const res = await answered;
  const body = await readSome(res, 2048);
  // Answered before the whole body was sent: this connection is in no state to be reused.
  if (!req.writableFinished) req.destroy();
  return { status: res.statusCode ?? 0, body, slotHolds: whole ? slotHolds : null };
}

/**
 * Writes buffer[from, to) in chunks, each after the bandwidth limit allows it, waiting for the socket
 * to drain, and for the last chunk to leave the buffer (so the caller may refill it).
 */
async function writeChunks(
  req: ClientRequest,
  buffer: Buffer,
  from: number,
  to: number,
  limit: BandwidthLimit | undefined,
  onWritten: ((bytes: number) => void) | undefined,
  partOffset: number,
  isOver: () => boolean,
  untilOver: (promise: Promise<unknown>) => Promise<unknown>,
): Promise<void> {
  let flushed: Promise<void> = Promise.resolve();
  for (let at = from; at < to && !isOver(); at += WRITE_CHUNK_BYTES) {
    const chunkEnd = Math.min(to, at + WRITE_CHUNK_BYTES);
    if (limit) await untilOver(limit.take(chunkEnd - at));
    if (isOver()) return;
    flushed = new Promise<void>((resolve) => req.write(buffer.subarray(at, chunkEnd), () => resolve()));
    onWritten?.(partOffset + chunkEnd - from);
    if (req.writableNeedDrain) await untilOver(once(req, 'drain'));
  }
  await untilOver(flushed);
}

/** The first bytes of an answer (an S3 error document), the rest drained so the connection is reused. */
async function readSome(res: IncomingMessage, max: number): Promise<string> {
  let text = '';
  try {
    for await (const chunk of res) {
      if (text.length < max) text += (chunk as Buffer).toString('utf8');
    }
  } catch {
    // A body cut off does not change the status.
  }
  return text.slice(0, max);
}

/** The S3 error code of an error document, e.g. `AccessDenied` or `RequestTimeTooSkewed`. */
export function storeErrorCode(body: string): string | null {
  return /<Code>([^<]+)<\/Code>/.exec(body)?.[1] ?? null;
}
