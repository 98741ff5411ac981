import { createReadStream } from 'node:fs';
import { stat } from 'node:fs/promises';
import { basename } from 'node:path';
import { Readable } from 'node:stream';
import { formatOfFileName, type ArchiveFormat } from '../archive.schema';

/** A byte range [start, end) of a stored file. */
export interface ByteRange {
  start: number;
  /** Exclusive. */
  end: number;
}

/**
 * Where the checker reads a stored file from: a local file, a buffer, or (in the worker) the
 * object store through ranged GETs. Each `open` is one sequential read of the whole file or of a range.
 */
export interface ByteSource<F extends ArchiveFormat = ArchiveFormat> {
  format: F;
  sizeBytes: number;
  open(range?: ByteRange): Promise<NodeJS.ReadableStream | Readable>;
  /** Set for a file on this machine: the whole-file hash then reads it on its own thread. */
  localPath?: string;
}

export type ResultArchiveFormat = 'tar.gz' | 'tar' | 'zip';
export type AttachmentFormat = 'pdf' | 'csv';
/** A result archive: tar and tar.gz are read as one stream, zip through ranged reads. */
export type ArchiveSource = ByteSource<ResultArchiveFormat>;
export type AttachmentSource = ByteSource<AttachmentFormat>;

/** Large reads: per-chunk overhead (stream bookkeeping, hashing calls) is what slows a multi-GiB pass. */
export const READ_CHUNK_BYTES = 1024 * 1024;

/** A file on this machine; its format from its name unless given. */
export async function localFileSource<F extends ArchiveFormat = ArchiveFormat>(path: string, format?: F): Promise<ByteSource<F>> {
  const resolved = format ?? formatOfFileName(basename(path));
  if (!resolved) throw new Error(`${path}: the format cannot be told from the name (.tar.gz, .tgz, .tar, .zip, .pdf or .csv)`);
  const info = await stat(path);
  if (!info.isFile()) throw new Error(`${path} is not a regular file`);
  return {
    format: resolved as F,
    sizeBytes: info.size,
    localPath: path,
    async open(range) {
      const { start, end } = clampRange(range, info.size);
      if (end <= start) return Readable.from([]);
      return createReadStream(path, { start, end: end - 1, highWaterMark: READ_CHUNK_BYTES });
    },
  };
}

/** A file held in memory (tests, small uploads). */
export function bufferSource<F extends ArchiveFormat>(buffer: Uint8Array, format: F): ByteSource<F> {
  const bytes = Buffer.from(buffer.buffer, buffer.byteOffset, buffer.byteLength);
  return {
    format,
    sizeBytes: bytes.byteLength,
    async open(range) {
      const { start, end } = clampRange(range, bytes.byteLength);
      const chunks: Buffer[] = [];
      for (let at = start; at < end; at += READ_CHUNK_BYTES) chunks.push(bytes.subarray(at, Math.min(end, at + READ_CHUNK_BYTES)));
      return Readable.from(chunks, { objectMode: false });
    },
  };
}

export function clampRange(range: ByteRange | undefined, sizeBytes: number): ByteRange {
  if (!range) return { start: 0, end: sizeBytes };
  const start = Math.max(0, Math.min(range.start, sizeBytes));
  return { start, end: Math.max(start, Math.min(range.end, sizeBytes)) };
}

/** Node streams and older `NodeJS.ReadableStream`s alike, as a `Readable`. */
export function asReadable(stream: NodeJS.ReadableStream | Readable): Readable {
  return stream instanceof Readable ? stream : new Readable({ highWaterMark: READ_CHUNK_BYTES }).wrap(stream);
}

export function isResultArchiveFormat(format: ArchiveFormat): format is ResultArchiveFormat {
  return format === 'tar.gz' || format === 'tar' || format === 'zip';
}
