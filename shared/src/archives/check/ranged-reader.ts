import { PassThrough, Readable } from 'node:stream';
import yauzl from 'yauzl';
import { asReadable, READ_CHUNK_BYTES, type ByteSource } from './archive-source';
import { inBlocks } from './block-reader';
import { SourceError } from './halt';

/**
 * How much a small read fetches. yauzl reads the central directory 46 bytes and a name at a time,
 * and each entry's local header before its data; against the object store each read is a GET, so
 * one window serves the many small reads that follow it (and the data of the small files after it).
 */
export const READ_WINDOW_BYTES = 256 * 1024;

/**
 * yauzl's random access over any ByteSource: data streams are ranged opens; small reads go through
 * one cached window. Errors of the source come out as SourceError, so that a failed GET is not
 * mistaken for a corrupt archive.
 */
export class SourceRangeReader extends yauzl.RandomAccessReader {
  private window: Buffer = Buffer.alloc(0);
  private windowStart = 0;
  private readonly streams = new Set<Readable>();
  private closed = false;

  constructor(private readonly source: ByteSource) {
    super();
  }

  _readStreamForRange(start: number, end: number): Readable {
    if (start >= this.windowStart && end <= this.windowStart + this.window.length) {
      return Readable.from([this.window.subarray(start - this.windowStart, end - this.windowStart)], { objectMode: false });
    }
    const out = new PassThrough({ highWaterMark: READ_CHUNK_BYTES });
    this.streams.add(out);
    out.on('close', () => this.streams.delete(out));
    Promise.resolve()
      .then(() => this.source.open({ start, end }))
      .then(
      (stream) => {
        const input = asReadable(stream);
        if (this.closed || out.destroyed) {
          input.destroy();
          return;
        }
        input.on('error', () => undefined); // thrown by the blocks' reading, below
        // An entry's bytes in blocks: fewer, larger chunks for yauzl's checks, inflate and the entry hash.
        const blocks = Readable.from(inBlocks(input, { blockBytes: Math.max(1, Math.min(READ_CHUNK_BYTES, end - start)) }), { objectMode: false });
        blocks.on('error', (error) => out.destroy(new SourceError(error)));
        out.on('close', () => {
          input.destroy();
          blocks.destroy();
        });
        blocks.pipe(out);
      },
      (error: unknown) => out.destroy(new SourceError(error)),
    );
    return out;
  }

  read(buffer: Buffer, offset: number, length: number, position: number, callback: (error: Error | null, bytesRead?: number) => void): void {
    const copy = () => {
      const available = Math.max(0, Math.min(length, this.windowStart + this.window.length - position));
      this.window.copy(buffer, offset, position - this.windowStart, position - this.windowStart + available);
      return available;
    };
    if (position >= this.windowStart && position + length <= this.windowStart + this.window.length) {
      const available = copy();
      setImmediate(() => callback(null, available));
      return;
    }
    const end = Math.min(this.source.sizeBytes, position + Math.max(length, READ_WINDOW_BYTES));
    void this.fetch(position, end).then(
      (bytes) => {
        this.window = bytes;
        this.windowStart = position;
        callback(null, copy());
      },
      (error: unknown) => callback(error instanceof SourceError ? error : new SourceError(error)),
    );
  }

  /** Stop every open range (the check ended early). */
  stopAll(): void {
    this.closed = true;
    for (const stream of this.streams) stream.destroy();
  }

  private async fetch(start: number, end: number): Promise<Buffer> {
    if (end <= start) return Buffer.alloc(0);
    const parts: Buffer[] = [];
    for await (const chunk of asReadable(await this.source.open({ start, end }))) parts.push(chunk as Buffer);
    return Buffer.concat(parts);
  }
}
