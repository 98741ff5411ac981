import { TABLE_COLUMNS, TABLE_KINDS, type TableKind } from '../archive.schema';
import { NumberStatus, lastRead, readPlainNumber } from './plain-number';
import type { ProblemList } from './problem-list';
import { describeDisorderSpan, disorderInSpec, energyInSpec, shortList, sizeInSpec, type SpecBounds } from './spec-bounds';

/** What one result table holds, for the archive's record and the analysis. */
export interface TableSummary {
  path: string;
  kind: TableKind;
  rows: number;
  /** Distinct L, ascending. */
  sizes: number[];
  disorderMin: number | null;
  disorderMax: number | null;
  /** Distinct E, ascending. */
  energies: number[];
}

export interface TablePoint {
  kind: TableKind;
  L: number;
  W: number;
  E: number;
  value: number;
  err: number;
}

export interface TableReaderOptions {
  /** The table's path in the archive, for messages. */
  path: string;
  maxRows: number;
  problems: ProblemList;
  /** The campaign's plan: rows outside it are counted and reported once per table. */
  bounds?: SpecBounds;
  /** Receives rows for the analysis; answers false once it wants no more. */
  collect?: (point: TablePoint) => boolean;
}

/** Problems listed per table before the rest are only counted. */
export const MAX_PROBLEMS_PER_TABLE = 20;
/** A line longer than this is not a numeric table row (and would have to be held whole). */
export const MAX_LINE_BYTES = 1024 * 1024;
/** Distinct sizes and energies kept for the summary: enough for any planned grid, bounded for a wild one. */
const MAX_DISTINCT = 100_000;

const FIELD_NAMES = ['L', 'W', 'E'];

interface OutsideCount {
  rows: number;
  firstLine: number;
  firstValue: number;
}

/**
 * A result table read line by line as its bytes arrive, in constant memory (only a partial line is
 * kept between chunks). The header must begin with one of TABLE_COLUMNS; in every row the first five
 * values are plain, finite, unquoted numbers, L a whole number ≥ 1 and the error not negative.
 * Further columns are not read.
 */
export class NumericTableReader {
  private kind: TableKind | null = null;
  private columns: readonly string[] = [];
  private line = 0;
  private rows = 0;
  private done = false;
  private carry: Buffer[] = [];
  private carryBytes = 0;
  private listed = 0;
  private unlisted = 0;
  private readonly sizes = new Set<number>();
  private readonly energies = new Set<number>();
  private disorderMin = Infinity;
  private disorderMax = -Infinity;
  private readonly outside = { sizes: null as OutsideCount | null, disorder: null as OutsideCount | null, energies: null as OutsideCount | null };
  private wantRows: boolean;

  constructor(private readonly options: TableReaderOptions) {
    this.wantRows = options.collect !== undefined;
  }

  write(chunk: Uint8Array): void {
    if (this.done || chunk.byteLength === 0) return;
    const bytes = Buffer.isBuffer(chunk) ? chunk : Buffer.from(chunk.buffer, chunk.byteOffset, chunk.byteLength);
    const lastNewline = bytes.lastIndexOf(10);
    if (lastNewline < 0) {
      this.keep(bytes);
      return;
    }
    let from = 0;
    if (this.carryBytes > 0) {
      // The line begun in earlier chunks ends in this one: join just that line.
      const firstNewline = bytes.indexOf(10);
      this.carry.push(bytes.subarray(0, firstNewline + 1));
      const joined = Buffer.concat(this.carry, this.carryBytes + firstNewline + 1);
      this.carry = [];
      this.carryBytes = 0;
      this.readLines(joined, 0, joined.length);
      from = firstNewline + 1;
    }
    if (from <= lastNewline) this.readLines(bytes, from, lastNewline + 1);
    if (lastNewline + 1 < bytes.length) this.keep(bytes.subarray(lastNewline + 1));
  }

  /** The summary, or null when the table was not readable as a result table. */
  end(): TableSummary | null {
    if (!this.done && this.carryBytes > 0) {
      const last = Buffer.concat([...this.carry, Buffer.from('\n')]);
      this.carry = [];
      this.carryBytes = 0;
      this.readLines(last, 0, last.length);
    }
    const { path, problems } = this.options;
    if (this.kind === null && !this.done) this.problem(this.line === 0 ? 'the table is empty: it needs a header line' : 'the table is empty');
    if (this.unlisted > 0) problems.add('table-invalid', `${path}: and ${this.unlisted.toLocaleString('en')} more problems in this table`, path);
    this.reportOutside();
    if (this.kind === null) return null;
    return {
      path,
      kind: this.kind,
      rows: this.rows,
      sizes: [...this.sizes].sort((a, b) => a - b),
      disorderMin: this.rows > 0 ? this.disorderMin : null,
      disorderMax: this.rows > 0 ? this.disorderMax : null,
      energies: [...this.energies].sort((a, b) => a - b),
    };
  }

  private keep(part: Buffer): void {
    if (this.done) return;
    this.carryBytes += part.length;
    if (this.carryBytes > MAX_LINE_BYTES) {
      this.problem(`line ${this.line + 1} is longer than ${MAX_LINE_BYTES / 1024 / 1024} MiB; this is not a numeric table`);
      this.stop();
      return;
    }
    this.carry.push(Buffer.from(part)); // a copy: the chunk's memory may be reused by the stream
  }

  private stop(): void {
    this.done = true;
    this.carry = [];
    this.carryBytes = 0;
  }

  private problem(message: string): void {
    if (this.listed >= MAX_PROBLEMS_PER_TABLE) {
      this.unlisted++;
      return;
    }
    this.listed++;
    this.options.problems.add('table-invalid', `${this.options.path}: ${message}`, this.options.path);
  }

  /** Lines in bytes[from, to), the last of which ends with "\n". */
  private readLines(bytes: Buffer, from: number, to: number): void {
    let at = from;
    if (this.line === 0 && at < to) at = this.readHeader(bytes, at, to);
    const { maxRows, bounds } = this.options;
    while (at < to && !this.done) {
      this.line++;
      let c = bytes[at];
      if (c === 10 || (c === 13 && bytes[at + 1] === 10)) {
        at += c === 10 ? 1 : 2; // blank lines are allowed (a trailing one is common)
        continue;
      }
      const L = readPlainNumber(bytes, at, to);
      let status = lastRead.status;
      let field = 0;
      let W = NaN;
      let E = NaN;
      let value = NaN;
      let err = NaN;
      if (status === NumberStatus.Ok && bytes[lastRead.end] === 44) {
        field = 1;
        W = readPlainNumber(bytes, lastRead.end + 1, to);
        status = lastRead.status;
        if (status === NumberStatus.Ok && bytes[lastRead.end] === 44) {
          field = 2;
          E = readPlainNumber(bytes, lastRead.end + 1, to);
          status = lastRead.status;
          if (status === NumberStatus.Ok && bytes[lastRead.end] === 44) {
            field = 3;
            value = readPlainNumber(bytes, lastRead.end + 1, to);
            status = lastRead.status;
            if (status === NumberStatus.Ok && bytes[lastRead.end] === 44) {
              field = 4;
              err = readPlainNumber(bytes, lastRead.end + 1, to);
              status = lastRead.status;
            }
          }
        }
      }
      let stopAt = lastRead.end;
      c = bytes[stopAt];
      const complete = field === 4 && status === NumberStatus.Ok;
      if (!complete) {
        this.badField(bytes, stopAt, field, status);
      } else if (this.rows >= maxRows) {
        this.problem(`the table has more than ${maxRows.toLocaleString('en')} rows, the most one table may have`);
        this.stop();
        return;
      } else {
        this.row(L, W, E, value, err, bounds);
      }
      // On to the next line: straight there after a five-column row, through the extra columns otherwise.
      if (c === 13 && bytes[stopAt + 1] === 10) at = stopAt + 2;
      else if (c === 10) at = stopAt + 1;
      else {
        stopAt = bytes.indexOf(10, stopAt);
        at = stopAt < 0 || stopAt >= to ? to : stopAt + 1;
      }
    }
  }

  private readHeader(bytes: Buffer, from: number, to: number): number {
    const newline = bytes.indexOf(10, from);
    const end = newline < 0 || newline >= to ? to : newline;
    this.line = 1;
    let text = bytes.toString('utf8', from, end);
    if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
    if (text.endsWith('\r')) text = text.slice(0, -1);
    const names = text.split(',').map((name) => name.trim());
    this.kind = TABLE_KINDS.find((kind) => TABLE_COLUMNS[kind].every((column, i) => names[i] === column)) ?? null;
    if (this.kind === null) {
      const expected = TABLE_KINDS.map((kind) => TABLE_COLUMNS[kind].join(',')).join(' or ');
      this.problem(`line 1: the header must begin with ${expected}; it is "${text.length > 80 ? text.slice(0, 80) + '…' : text}"`);
      this.stop();
      return to;
    }
    this.columns = [...FIELD_NAMES, ...TABLE_COLUMNS[this.kind].slice(3)];
    return end + 1;
  }

  private badField(bytes: Buffer, at: number, field: number, status: NumberStatus): void {
    const column = this.columns[field];
    if (status === NumberStatus.Ok) {
      this.problem(`line ${this.line}: the row has ${field + 1} column${field === 0 ? '' : 's'}; a row needs the five ${this.columns.join(', ')}`);
      return;
    }
    if (status === NumberStatus.Empty) {
      this.problem(`line ${this.line}, column ${column}: the value is missing`);
      return;
    }
    if (status === NumberStatus.Quoted) {
      this.problem(`line ${this.line}, column ${column}: quoted values are not accepted in the first five columns; write plain numbers`);
      return;
    }
    // Show the offending cell: back from the delimiter to the previous comma or the line's start.
    let start = at;
    while (start > 0 && bytes[start - 1] !== 44 && bytes[start - 1] !== 10) start--;
    const cell = bytes.toString('utf8', start, Math.min(at, start + 40)).trim();
    this.problem(`line ${this.line}, column ${column}: "${cell}" is not a plain finite number`);
  }

  private row(L: number, W: number, E: number, value: number, err: number, bounds: SpecBounds | undefined): void {
    if (!Number.isFinite(L) || !Number.isFinite(W) || !Number.isFinite(E) || !Number.isFinite(value) || !Number.isFinite(err)) {
      const column = this.columns[[L, W, E, value, err].findIndex((v) => !Number.isFinite(v))];
      this.problem(`line ${this.line}, column ${column}: the value is too large to be a finite number`);
      return;
    }
    if (!Number.isInteger(L) || L < 1) {
      this.problem(`line ${this.line}, column L: ${L} is not a whole number of at least 1`);
      return;
    }
    if (err < 0) {
      this.problem(`line ${this.line}, column ${this.columns[4]}: an error bar cannot be negative (${err})`);
      return;
    }
    this.rows++;
    if (this.sizes.size < MAX_DISTINCT) this.sizes.add(L);
    if (this.energies.size < MAX_DISTINCT) this.energies.add(E);
    if (W < this.disorderMin) this.disorderMin = W;
    if (W > this.disorderMax) this.disorderMax = W;
    if (bounds) {
      if (!sizeInSpec(bounds, L)) this.outside.sizes = this.countOutside(this.outside.sizes, L);
      if (!disorderInSpec(bounds, W)) this.outside.disorder = this.countOutside(this.outside.disorder, W);
      if (!energyInSpec(bounds, E)) this.outside.energies = this.countOutside(this.outside.energies, E);
    }
    if (this.wantRows && this.kind) this.wantRows = this.options.collect!({ kind: this.kind, L, W, E, value, err });
  }

  private countOutside(count: OutsideCount | null, value: number): OutsideCount {
    if (!count) return { rows: 1, firstLine: this.line, firstValue: value };
    count.rows++;
    return count;
  }

  /** One problem per table, however many rows stray from the plan. */
  private reportOutside(): void {
    const { bounds, path, problems } = this.options;
    const { sizes, disorder, energies } = this.outside;
    if (!bounds || (!sizes && !disorder && !energies)) return;
    const rows = (n: number) => `${n.toLocaleString('en')} row${n === 1 ? '' : 's'}`;
    const parts: string[] = [];
    if (sizes) parts.push(`${rows(sizes.rows)} with L not among the planned sizes ${shortList(bounds.sizeList)} (first at line ${sizes.firstLine}: L = ${sizes.firstValue})`);
    if (disorder) parts.push(`${rows(disorder.rows)} with W outside ${describeDisorderSpan(bounds)} (first at line ${disorder.firstLine}: W = ${disorder.firstValue})`);
    if (energies) parts.push(`${rows(energies.rows)} with E not among the planned energies ${shortList([...bounds.energies])} (first at line ${energies.firstLine}: E = ${energies.firstValue})`);
    problems.add('outside-spec', `${path}: points outside the campaign's plan: ${parts.join('; ')}`, path);
  }
}
