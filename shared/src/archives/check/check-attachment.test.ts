import { describe, expect, it } from 'vitest';
import type { ArchiveProblemCode } from '../archive.schema';
import { sha256Hex } from './archive-fixtures';
import { bufferSource } from './archive-source';
import { checkAttachment, type AttachmentCheckResult } from './check-attachment';

const codes = (result: AttachmentCheckResult): ArchiveProblemCode[] => result.problems.map((p) => p.code).sort();
const PDF = Buffer.from('%PDF-1.7\n1 0 obj << /Type /Catalog >> endobj\n%%EOF\n');
const TIMINGS = Buffer.from('size,seconds,cores\n8,120,16\n12,900,16\n');

describe('checkAttachment', () => {
  it('a PDF: hash, size and its "%PDF-" start', async () => {
    const result = await checkAttachment(bufferSource(PDF, 'pdf'), { sha256: sha256Hex(PDF), sizeBytes: PDF.length });
    expect(result).toEqual({ sha256: sha256Hex(PDF), sizeBytes: PDF.length, problems: [] });
  });

  it('a file named .pdf that is not one', async () => {
    expect(codes(await checkAttachment(bufferSource(Buffer.from('<html>not a pdf</html>'), 'pdf')))).toEqual(['wrong-type']);
    expect(codes(await checkAttachment(bufferSource(Buffer.alloc(0), 'pdf')))).toEqual(['wrong-type']);
  });

  it('pilot timings: UTF-8 text whose header names size, seconds and cores (any order, quoted, more columns)', async () => {
    expect((await checkAttachment(bufferSource(TIMINGS, 'csv'))).problems).toEqual([]);
    const other = Buffer.from('\uFEFF"Cores", "size",seconds,node\r\n16,8,120,a\r\n');
    expect((await checkAttachment(bufferSource(other, 'csv'))).problems).toEqual([]);
  });

  it('pilot timings without the columns, or not text', async () => {
    const noCores = await checkAttachment(bufferSource(Buffer.from('size,seconds\n8,120\n'), 'csv'));
    expect(codes(noCores)).toEqual(['table-invalid']);
    expect(noCores.problems[0].message).toContain('it lacks cores');
    expect(codes(await checkAttachment(bufferSource(Buffer.from([0x73, 0x69, 0xff, 0xfe, 0x0a]), 'csv')))).toEqual(['wrong-type']);
    expect(codes(await checkAttachment(bufferSource(Buffer.from('size,seconds,cores\n\0\0\0'), 'csv')))).toEqual(['wrong-type']);
  });

  it('the declared hash and size must match', async () => {
    const result = await checkAttachment(bufferSource(PDF, 'pdf'), { sha256: sha256Hex('other'), sizeBytes: 3 });
    expect(codes(result)).toEqual(['checksum-mismatch', 'size-mismatch']);
  });

  it('an archive is not an attachment', async () => {
    expect(codes(await checkAttachment(bufferSource(PDF, 'zip')))).toEqual(['wrong-type']);
  });
});
