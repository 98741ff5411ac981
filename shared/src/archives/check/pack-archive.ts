import { createHash } from 'node:crypto';
import { createReadStream, createWriteStream } from 'node:fs';
import { readdir, rm, stat } from 'node:fs/promises';
import { join, relative, resolve, sep } from 'node:path';
import { Transform, type Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { createGzip } from 'node:zlib';
import { pack as tarPack } from 'tar-stream';
import { ZipFile } from 'yazl';
import { ARCHIVE_FORMAT_VERSION, ArchiveManifest } from '../archive.schema';
import { READ_CHUNK_BYTES, type ResultArchiveFormat } from './archive-source';
import { MANIFEST_NAME } from './entry-names';

export interface PackArchiveOptions {
  /** The folder whose regular files go into the archive (a manifest.json at its root is replaced). */
  dir: string;
  /** The archive file to write. */
  out: string;
  format: ResultArchiveFormat;
  manifest: Omit<ArchiveManifest, 'files' | 'formatVersion'>;
  /** Called as each file is hashed, for a progress line. */
  onFile?: (path: string, sizeBytes: number) => void;
}

interface PackedFile {
  path: string;
  absolute: string;
  sizeBytes: number;
  mtime: Date;
}

/**
 * Writes a result archive from a folder: every regular file (sorted, relative, forward slashes) is
 * read once to hash it, manifest.json goes first, then the files are streamed in. Constant memory,
 * whatever the sizes. Symbolic links and other special files are left out, as the checker would
 * refuse them. Returns the manifest written.
 */
export async function packArchive(options: PackArchiveOptions): Promise<ArchiveManifest> {
  const dir = resolve(options.dir);
  const out = resolve(options.out);
  const found = await regularFiles(dir, out);
  const files: ArchiveManifest['files'] = [];
  for (const file of found) {
    files.push({ path: file.path, sizeBytes: file.sizeBytes, sha256: await hashFile(file.absolute) });
    options.onFile?.(file.path, file.sizeBytes);
  }
  const parsed = ArchiveManifest.safeParse({ formatVersion: ARCHIVE_FORMAT_VERSION, ...options.manifest, files });
  if (!parsed.success) {
    const lines = parsed.error.issues.map((issue) => `${issue.path.map(String).join('.') || 'manifest'}: ${issue.message}`);
    throw new Error(`the manifest would not be valid:\n${lines.join('\n')}`);
  }
  const manifest = parsed.data;
  const manifestBytes = Buffer.from(JSON.stringify(manifest, null, 2) + '\n');
  try {
    if (options.format === 'zip') await writeZip(out, manifestBytes, found);
    else await writeTar(out, manifestBytes, found, options.format === 'tar.gz');
  } catch (error) {
    await rm(out, { force: true });
    throw error;
  }
  return manifest;
}

async function regularFiles(dir: string, out: string): Promise<PackedFile[]> {
  const files: PackedFile[] = [];
  const walk = async (folder: string): Promise<void> => {
    for (const entry of await readdir(folder, { withFileTypes: true })) {
      const absolute = join(folder, entry.name);
      if (entry.isDirectory()) await walk(absolute);
      else if (entry.isFile() && absolute !== out) {
        const path = relative(dir, absolute).split(sep).join('/');
        if (path === MANIFEST_NAME) continue;
        const info = await stat(absolute);
        files.push({ path, absolute, sizeBytes: info.size, mtime: info.mtime });
      }
    }
  };
  await walk(dir);
  // Plain code-unit order: the same on every machine, whatever the locale.
  return files.sort((a, b) => (a.path < b.path ? -1 : a.path > b.path ? 1 : 0));
}

async function hashFile(path: string): Promise<string> {
  const hash = createHash('sha256');
  for await (const chunk of createReadStream(path, { highWaterMark: READ_CHUNK_BYTES })) hash.update(chunk as Buffer);
  return hash.digest('hex');
}

/** The file's bytes as hashed: a file that changed size since then stops the packing. */
function sameSizeStream(file: PackedFile): Readable {
  let seen = 0;
  const check = new Transform({
    transform(chunk: Buffer, _encoding, callback) {
      seen += chunk.length;
      callback(seen > file.sizeBytes ? changed(file) : null, chunk);
    },
    flush(callback) {
      callback(seen !== file.sizeBytes ? changed(file) : null);
    },
  });
  const input = createReadStream(file.absolute, { highWaterMark: READ_CHUNK_BYTES });
  input.on('error', (error) => check.destroy(error));
  return input.pipe(check);
}

function changed(file: PackedFile): Error {
  return new Error(`${file.path} changed while it was being packed; pack again once it is complete`);
}

async function writeTar(out: string, manifestBytes: Buffer, files: PackedFile[], gzip: boolean): Promise<void> {
  const pack = tarPack();
  const output = createWriteStream(out);
  const written = gzip ? pipeline(pack as unknown as Readable, createGzip(), output) : pipeline(pack as unknown as Readable, output);
  const add = async () => {
    pack.entry({ name: MANIFEST_NAME, mode: 0o644, mtime: new Date() }, manifestBytes);
    for (const file of files) {
      await new Promise<void>((resolvePacked, reject) => {
        const sink = pack.entry({ name: file.path, size: file.sizeBytes, mode: 0o644, mtime: file.mtime }, (error) => (error ? reject(error) : resolvePacked()));
        const input = sameSizeStream(file);
        input.on('error', (error) => {
          sink.destroy(error);
          reject(error);
        });
        input.on('data', (chunk: Buffer) => {
          if (!sink.write(chunk)) {
            input.pause();
            sink.once('drain', () => input.resume());
          }
        });
        input.on('end', () => sink.end(undefined));
      });
    }
    pack.finalize();
  };
  try {
    await Promise.all([add(), written]);
  } catch (error) {
    pack.destroy(error as Error);
    throw error;
  }
}

async function writeZip(out: string, manifestBytes: Buffer, files: PackedFile[]): Promise<void> {
  const zip = new ZipFile();
  zip.addBuffer(manifestBytes, MANIFEST_NAME, { mode: 0o100644 });
  for (const file of files) {
    // Lazily: one file open at a time, whatever the count.
    zip.addReadStreamLazy(file.path, { size: file.sizeBytes, mtime: file.mtime, mode: 0o100644 }, (callback) => callback(null, sameSizeStream(file)));
  }
  zip.end();
  await pipeline(zip.outputStream as Readable, createWriteStream(out));
}
