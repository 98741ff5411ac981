import { createHash } from 'node:crypto';
import { MAX_ATTACHMENT_BYTES, type ArchiveProblem } from '../archive.schema';
import { asReadable, type AttachmentSource, type ByteSource } from './archive-source';
import { formatBytes } from './archive-inspector';
import { ProblemList } from './problem-list';

export interface AttachmentCheckResult {
  /** SHA-256 of the file; null when it was not read to the end. */
  sha256: string | null;
  sizeBytes: number;
  problems: ArchiveProblem[];
}

export interface AttachmentExpectation {
  sha256?: string;
  sizeBytes?: number;
}

/** The columns a pilot-timings CSV names in its header (any order, other columns allowed). */
export const PILOT_TIMING_COLUMNS = ['size', 'seconds', 'cores'] as const;
const PDF_MAGIC = Buffer.from('%PDF-');
/** The header line must end within this many bytes. */
const MAX_HEADER_BYTES = 64 * 1024;

/**
 * A proposal's attachment: its SHA-256 and size against the upload, and that it is what it claims
 * to be (a PDF starts with "%PDF-"; pilot timings are UTF-8 text whose header names size, seconds
 * and cores). The rows of pilot timings are the api's business (it parses them into the proposal).
 */
export async function checkAttachment(source: AttachmentSource | ByteSource, expected: AttachmentExpectation = {}, options: { signal?: AbortSignal } = {}): Promise<AttachmentCheckResult> {
  const problems = new ProblemList();
  if (expected.sizeBytes !== undefined && expected.sizeBytes !== source.sizeBytes) {
    problems.add('size-mismatch', `the stored file has ${source.sizeBytes.toLocaleString('en')} bytes; the upload declared ${expected.sizeBytes.toLocaleString('en')}`);
  }
  if (source.format !== 'pdf' && source.format !== 'csv') {
    problems.add('wrong-type', `an attachment is a .pdf or a .csv file, not a .${source.format} file`);
    return { sha256: null, sizeBytes: source.sizeBytes, problems: problems.list() };
  }
  if (source.sizeBytes > MAX_ATTACHMENT_BYTES) {
    problems.add('too-large', `an attachment may be at most ${formatBytes(MAX_ATTACHMENT_BYTES)}; this one has ${formatBytes(source.sizeBytes)}`);
    return { sha256: null, sizeBytes: source.sizeBytes, problems: problems.list() };
  }

  const hash = createHash('sha256');
  const text = source.format === 'csv' ? new CsvTextCheck() : null;
  let head = Buffer.alloc(0);
  let sizeBytes = 0;
  const input = asReadable(await source.open());
  const stop = () => input.destroy();
  options.signal?.addEventListener('abort', stop, { once: true });
  try {
    for await (const chunk of input as AsyncIterable<Buffer>) {
      if (options.signal?.aborted) break;
      hash.update(chunk);
      sizeBytes += chunk.length;
      if (head.length < PDF_MAGIC.length) head = Buffer.concat([head, chunk.subarray(0, PDF_MAGIC.length)]);
      text?.write(chunk);
    }
  } finally {
    options.signal?.removeEventListener('abort', stop);
  }
  if (options.signal?.aborted) throw options.signal.reason ?? new Error('the attachment check was cancelled');

  const sha256 = hash.digest('hex');
  if (sizeBytes !== source.sizeBytes) problems.add('size-mismatch', `${sizeBytes.toLocaleString('en')} bytes were read; the store gives the file's size as ${source.sizeBytes.toLocaleString('en')}`);
  if (expected.sha256 !== undefined && expected.sha256.toLowerCase() !== sha256) problems.add('checksum-mismatch', `the file's SHA-256 is ${sha256}; the upload declared ${expected.sha256}`);
  if (source.format === 'pdf' && !head.subarray(0, PDF_MAGIC.length).equals(PDF_MAGIC)) {
    problems.add('wrong-type', 'this is not a PDF: a PDF file begins with "%PDF-"');
  }
  if (text) text.end(problems);
  return { sha256, sizeBytes, problems: problems.list() };
}

/** UTF-8 text without NUL bytes, whose first line names the pilot-timing columns. */
class CsvTextCheck {
  private readonly decoder = new TextDecoder('utf-8', { fatal: true });
  private notText: string | null = null;
  private header = '';
  private headerDone = false;

  write(chunk: Buffer): void {
    if (this.notText) return;
    if (chunk.includes(0)) {
      this.notText = 'it contains NUL bytes, so it is binary, not a CSV text file';
      return;
    }
    let decoded: string;
    try {
      decoded = this.decoder.decode(chunk, { stream: true });
    } catch {
      this.notText = 'it is not UTF-8 text';
      return;
    }
    if (!this.headerDone) {
      const newline = decoded.indexOf('\n');
      this.header += newline < 0 ? decoded : decoded.slice(0, newline);
      if (newline >= 0) this.headerDone = true;
      else if (this.header.length > MAX_HEADER_BYTES) this.headerDone = true;
    }
  }

  end(problems: ProblemList): void {
    if (!this.notText) {
      try {
        this.header += this.headerDone ? '' : this.decoder.decode();
      } catch {
        this.notText = 'it is not UTF-8 text';
      }
    }
    if (this.notText) {
      problems.add('wrong-type', `this is not a pilot-timings CSV: ${this.notText}`);
      return;
    }
    const names = this.header
      .replace(/^\uFEFF/, '')
      .replace(/\r$/, '')
      .split(',')
      .map((name) => name.trim().replace(/^"(.*)"$/, '$1').trim().toLowerCase());
    const missing = PILOT_TIMING_COLUMNS.filter((column) => !names.includes(column));
    if (missing.length) {
      problems.add('table-invalid', `the pilot-timings header must name the columns ${PILOT_TIMING_COLUMNS.join(', ')}; it lacks ${missing.join(', ')}`);
    }
  }
}
