import type { Readable, Writable } from 'node:stream';
import { createGunzip } from 'node:zlib';
import { extract as tarExtract, type Header } from 'tar-stream';
import type { EntryKind } from './archive-inspector';
import { asReadable, type ArchiveSource } from './archive-source';
import { inBlocks } from './block-reader';
import { Halt, SourceError, progressReporter, type WalkContext, type WalkResult } from './halt';

/** Zlib output chunks: larger ones cost less per byte (fewer calls, events and parser steps). */
const INFLATE_CHUNK_BYTES = 256 * 1024;
/** The stored file is read in blocks growing from this to READ_CHUNK_BYTES (see inBlocks). */
const FIRST_BLOCK_BYTES = 64 * 1024;

/**
 * A tar or tar.gz archive in one sequential pass: each chunk goes to the whole-file hash and on to
 * gunzip (when compressed) and the tar parser, whose entries are checked and hashed as they stream by.
 */
export async function readTar(source: ArchiveSource, context: WalkContext): Promise<WalkResult> {
  const { inspector, hasher } = context;
  const halt = new Halt(context.signal);
  const progress = progressReporter(source.sizeBytes, context.onProgress);
  const extract = tarExtract();
  const gunzip = source.format === 'tar.gz' ? createGunzip({ chunkSize: INFLATE_CHUNK_BYTES }) : null;
  let bytesRead = 0;
  let inflated = 0;
  let input: Readable | null = null;
  const dataInFile = source.format === 'tar';

  halt.signal.addEventListener('abort', () => {
    input?.destroy();
    gunzip?.destroy();
    extract.destroy();
  });

  const finished = new Promise<void>((resolve) => {
    extract.on('finish', () => resolve());
    void halt.whenHalted().then(resolve);
  });
  extract.on('error', (error: Error) => halt.fail(error, 'the archive is not a readable tar'));
  extract.on('entry', (header, stream, next) => {
    stream.on('error', () => undefined); // the parser's own error event reports it
    if (halt.halted) return;
    let sink;
    try {
      // In a plain tar an entry's bytes lie in the file as they are, right after its header.
      const fileOffset = dataInFile ? (header as Header & { byteOffset?: number }).byteOffset : undefined;
      sink = inspector.beginEntry(header.name, kindOf(header.type), header.size ?? 0, fileOffset);
    } catch (error) {
      halt.fail(error, 'the archive is not a readable tar');
      return;
    }
    if (!sink) {
      stream.on('end', () => next());
      stream.resume();
      return;
    }
    const entry = sink;
    stream.on('data', (chunk: unknown) => {
      if (halt.halted) return;
      const room = entry.write(chunk as Buffer);
      if (room) {
        // The entry thread's ring is full: hold the tar parser (and so the reading) until it has room.
        stream.pause();
        room.then(
          () => stream.resume(),
          (error: unknown) => halt.fail(new SourceError(error), 'the entry hash'),
        );
      }
    });
    stream.on('end', () => {
      if (halt.halted) return;
      entry.end();
      next();
    });
  });

  if (gunzip) {
    gunzip.on('error', (error) => halt.fail(error, 'the archive is not a readable gzip stream'));
    gunzip.on('data', (chunk: Buffer) => {
      inflated += chunk.byteLength;
      try {
        inspector.checkRatio(inflated, bytesRead);
      } catch (error) {
        halt.fail(error, 'the archive');
        return;
      }
      if (!extract.write(chunk)) gunzip.pause();
    });
    extract.on('drain', () => gunzip.resume());
    gunzip.on('end', () => extract.end(undefined));
  }
  const head = (gunzip ?? extract) as unknown as Writable;

  try {
    input = asReadable(await source.open());
    input.on('error', () => undefined); // read by the loop below
    for await (const chunk of inBlocks(input, { firstBlockBytes: FIRST_BLOCK_BYTES })) {
      if (halt.halted) break;
      bytesRead += chunk.byteLength;
      progress.report(bytesRead);
      const room = hasher.update(chunk);
      if (room) await room;
      if (!head.write(chunk)) await drained(head, halt);
    }
    if (!halt.halted) head.end(undefined);
  } catch (error) {
    if (!halt.halted) halt.fail(new SourceError(error), 'the store');
  }
  await finished;
  const completed = halt.settle(inspector);
  if (completed) progress.done(bytesRead);
  return { completed, bytesRead };
}

function drained(stream: Writable, halt: Halt): Promise<void> {
  return new Promise((resolve) => {
    const done = () => {
      stream.off('drain', done);
      halt.signal.removeEventListener('abort', done);
      resolve();
    };
    stream.once('drain', done);
    halt.signal.addEventListener('abort', done, { once: true });
  });
}

function kindOf(type: Header['type'] | null | undefined): EntryKind {
  switch (type) {
    case 'file':
    case 'contiguous-file':
      return 'file';
    case 'directory':
    case 'symlink':
    case 'link':
    case 'character-device':
    case 'block-device':
    case 'fifo':
      return type;
    default:
      return 'unknown';
  }
}
