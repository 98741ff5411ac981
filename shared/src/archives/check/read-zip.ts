import type { Readable } from 'node:stream';
import yauzl from 'yauzl';
import type { EntryKind } from './archive-inspector';
import { asReadable, type ArchiveSource } from './archive-source';
import { Halt, SourceError, progressReporter, type WalkContext, type WalkResult } from './halt';
import { SourceRangeReader } from './ranged-reader';

/** Host systems whose external attributes carry a Unix mode in their upper 16 bits. */
const UNIX_HOSTS = new Set([3 /* Unix */, 19 /* OS X */]);

/**
 * A zip archive: the whole-file hash is one sequential pass over the file while yauzl walks the
 * central directory and reads each entry through ranged reads (the two run side by side). The
 * compression ratio is judged from the sizes the central directory declares, before anything is
 * inflated; yauzl then refuses an entry that inflates to more than it declared.
 */
export async function readZip(source: ArchiveSource, context: WalkContext): Promise<WalkResult> {
  const halt = new Halt(context.signal);
  const reader = new SourceRangeReader(source);
  halt.signal.addEventListener('abort', () => reader.stopAll());
  // A hasher that reads the (local) file by itself needs no sequential pass here; progress then
  // follows the entries.
  const sequential = context.hasher.needsBytes;
  const [bytesRead] = await Promise.all([sequential ? hashWholeFile(source, context, halt) : Promise.resolve(source.sizeBytes), readEntries(source, reader, context, halt, !sequential)]);
  const completed = halt.settle(context.inspector);
  if (completed) context.onProgress?.(bytesRead, source.sizeBytes);
  return { completed, bytesRead };
}

async function hashWholeFile(source: ArchiveSource, context: WalkContext, halt: Halt): Promise<number> {
  const progress = progressReporter(source.sizeBytes, context.onProgress);
  let bytesRead = 0;
  let input: Readable | null = null;
  const stop = () => input?.destroy();
  halt.signal.addEventListener('abort', stop, { once: true });
  try {
    input = asReadable(await source.open());
    if (halt.halted) input.destroy();
    for await (const chunk of input as AsyncIterable<Buffer>) {
      if (halt.halted) break;
      bytesRead += chunk.byteLength;
      progress.report(bytesRead);
      const room = context.hasher.update(chunk);
      if (room) await room;
    }
  } catch (error) {
    if (!halt.halted) halt.fail(new SourceError(error), 'the store');
  } finally {
    halt.signal.removeEventListener('abort', stop);
  }
  return bytesRead;
}

async function readEntries(source: ArchiveSource, reader: SourceRangeReader, context: WalkContext, halt: Halt, reportProgress: boolean): Promise<void> {
  const { inspector } = context;
  const progress = progressReporter(source.sizeBytes, reportProgress ? context.onProgress : undefined);
  const what = 'the archive is not a readable zip';
  let zip: yauzl.ZipFile;
  try {
    // Names decoded here, not by yauzl: with decodeStrings it stops at the first unsafe name, and
    // each unsafe name should be reported. strictFileNames keeps backslashes for the check.
    zip = await yauzl.fromRandomAccessReaderPromise(reader, source.sizeBytes, { lazyEntries: true, decodeStrings: false, validateEntrySizes: true, strictFileNames: true, autoClose: false });
  } catch (error) {
    halt.fail(error, what);
    return;
  }
  if (zip.entryCount > inspector.maxEntries) {
    // Known from the end record: refused before reading a single entry.
    inspector.problems.add('too-many-entries', `the archive has ${zip.entryCount.toLocaleString('en')} entries; verification unpacks at most ${inspector.maxEntries.toLocaleString('en')}`);
    halt.set({ kind: 'stop' });
    zip.close();
    return;
  }
  let packed = 0;
  let unpacked = 0;
  let current: Readable | null = null;
  const stop = () => current?.destroy();
  halt.signal.addEventListener('abort', stop, { once: true });
  try {
    for await (const entry of zip.eachEntry()) {
      if (halt.halted) break;
      const name = yauzl.getFileNameLowLevel(entry.generalPurposeBitFlag, entry.fileNameRaw, entry.extraFields, true);
      const kind = kindOf(entry, name);
      if (kind === 'file') {
        packed += entry.compressedSize;
        unpacked += entry.uncompressedSize;
        // Entries may share their data (overlapping entries), so the packed side is at most the file.
        inspector.checkRatio(unpacked, Math.min(packed, source.sizeBytes));
      }
      // A large stored entry of a zip on this machine lies in the file as it is: hashed from there.
      const stored = kind === 'file' && entry.compressionMethod === 0 && !entry.isEncrypted();
      const fileOffset = stored && inspector.hashesFromFile(entry.uncompressedSize) ? (await zip.readLocalFileHeaderPromise(entry, { minimal: true })).fileDataStart : undefined;
      const sink = inspector.beginEntry(name, kind, entry.uncompressedSize, fileOffset);
      if (!sink) continue;
      if (entry.isEncrypted() || (entry.compressionMethod !== 0 && entry.compressionMethod !== 8)) {
        inspector.dropEntry(sink.name);
        inspector.problems.add('unreadable', `"${sink.name}" ${entry.isEncrypted() ? 'is encrypted' : `uses compression method ${entry.compressionMethod}; only stored (0) and deflate (8) are read`}`, sink.name);
        continue;
      }
      if (!sink.needsBytes) {
        // Stored: its size is its compressed size, checked against the file's bounds by yauzl.
        sink.endUnread(entry.uncompressedSize);
        progress.report(Math.min(packed, source.sizeBytes));
        continue;
      }
      current = await zip.openReadStreamPromise(entry);
      if (halt.halted) break;
      for await (const chunk of current as AsyncIterable<Buffer>) {
        if (halt.halted) break;
        const room = sink.write(chunk);
        if (room) await room;
      }
      current = null;
      if (halt.halted) break;
      sink.end();
      progress.report(Math.min(packed, source.sizeBytes));
    }
  } catch (error) {
    if (!halt.halted) halt.fail(error, what);
  } finally {
    halt.signal.removeEventListener('abort', stop);
    current?.destroy();
    zip.close();
  }
}

function kindOf(entry: yauzl.Entry, name: string): EntryKind {
  if (UNIX_HOSTS.has(entry.versionMadeBy >> 8)) {
    switch ((entry.externalFileAttributes >>> 16) & 0o170000) {
      case 0o120000:
        return 'symlink';
      case 0o020000:
        return 'character-device';
      case 0o060000:
        return 'block-device';
      case 0o010000:
        return 'fifo';
      case 0o140000:
        return 'unknown'; // a socket
      case 0o040000:
        return 'directory';
    }
  }
  return name.endsWith('/') ? 'directory' : 'file';
}
