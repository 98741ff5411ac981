import type { ArchiveProblem, ArchiveProblemCode } from '../archive.schema';

/**
 * One problem per finding, but a bounded list: an archive of 100 000 stray files would otherwise
 * produce a report nobody reads and a row too large to store. Past `perCode` problems of one code,
 * the rest are counted and summed up in one last problem of that code.
 */
export class ProblemList {
  private readonly items: ArchiveProblem[] = [];
  private readonly counts = new Map<ArchiveProblemCode, number>();

  constructor(private readonly perCode = 100) {}

  add(code: ArchiveProblemCode, message: string, path?: string): void {
    const count = (this.counts.get(code) ?? 0) + 1;
    this.counts.set(code, count);
    if (count <= this.perCode) this.items.push(path === undefined ? { code, message } : { code, message, path });
  }

  has(code: ArchiveProblemCode): boolean {
    return this.counts.has(code);
  }

  get size(): number {
    return this.items.length;
  }

  list(): ArchiveProblem[] {
    const out = [...this.items];
    for (const [code, count] of this.counts) {
      if (count > this.perCode) out.push({ code, message: `and ${(count - this.perCode).toLocaleString('en')} more problems of this kind` });
    }
    return out;
  }
}
