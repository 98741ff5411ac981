import { parse } from 'csv-parse/browser/esm/sync';
import { z } from 'zod';
import { QueryBoolean } from '../lists';
import { RunInput } from './run.schema';

/**
 * Accounting CSVs exported from batch schedulers: one row per job, column names that differ
 * between schedulers. The import maps columns to run fields (guessed from the header, then
 * confirmed or changed by the person), checks every row, and only then writes anything.
 */
export const IMPORT_FIELDS = [
  'externalJobId', 'startedAt', 'endedAt', 'elapsedSeconds', 'cores', 'coreHours', 'codeName', 'codeVersion', 'machine',
  'sizes', 'disorder', 'energies', 'seeds',
] as const;
export const ImportField = z.enum(IMPORT_FIELDS);
export type ImportField = z.infer<typeof ImportField>;

export const IMPORT_FIELD_LABELS: Record<ImportField, string> = {
  externalJobId: 'Job id',
  startedAt: 'Start',
  endedAt: 'End',
  elapsedSeconds: 'Elapsed (seconds or [D-]HH:MM:SS)',
  cores: 'Cores',
  coreHours: 'Core-hours',
  codeName: 'Code name',
  codeVersion: 'Code version',
  machine: 'Machine',
  sizes: 'Sizes L',
  disorder: 'Disorder W',
  energies: 'Energies E',
  seeds: 'Seeds',
};

/** Header names schedulers and spreadsheets use, compared without case, spaces or punctuation. */
const HEADER_SYNONYMS: Record<ImportField, string[]> = {
  externalJobId: ['jobid', 'job', 'jobidraw', 'externaljobid', 'jobnumber'],
  startedAt: ['start', 'starttime', 'started', 'startedat', 'begin'],
  endedAt: ['end', 'endtime', 'ended', 'endedat', 'finish'],
  elapsedSeconds: ['elapsed', 'elapsedraw', 'elapsedseconds', 'walltime', 'wallclock', 'walltimeseconds'],
  cores: ['cores', 'alloccpus', 'ncpus', 'cpus', 'numcpus', 'ncores'],
  coreHours: ['corehours', 'cpuhours', 'corehour'],
  codeName: ['codename', 'code', 'jobname', 'name'],
  codeVersion: ['codeversion', 'version', 'commit', 'comment'],
  machine: ['machine', 'cluster', 'system'],
  sizes: ['sizes', 'size', 'l'],
  disorder: ['disorder', 'w'],
  energies: ['energies', 'energy', 'e'],
  seeds: ['seeds', 'seed'],
};

const normalise = (header: string) => header.toLowerCase().replace(/[^a-z0-9]/g, '');

export const ImportMapping = z.record(z.string().max(200), z.union([ImportField, z.literal('ignore')]), { message: 'mapping maps column names to run fields or "ignore"' });
export type ImportMapping = z.infer<typeof ImportMapping>;

export const MAX_IMPORT_BYTES = 5_000_000;
export const MAX_IMPORT_ROWS = 20_000;

export const RunImportRequest = z
  .object({
    csv: z.string().min(1, 'paste or upload the CSV').max(MAX_IMPORT_BYTES, 'the CSV may be at most 5 MB; split it into several imports'),
    /** Column -> field or "ignore". Columns left out are guessed from their header. */
    mapping: ImportMapping.optional(),
    /** Used where the CSV has no such column. */
    defaults: z
      .object({ codeName: z.string().trim().min(1).max(100).optional(), codeVersion: z.string().trim().min(1).max(100).optional() })
      .strict()
      .optional(),
  })
  .strict()
  .meta({ id: 'RunImportRequest' });
export type RunImportRequest = z.infer<typeof RunImportRequest>;

export const RunImportQuery = z.object({ dryRun: QueryBoolean.default(false) });

export const ImportRow = z.object({
  line: z.number().int(),
  externalJobId: z.string().nullable(),
  startedAt: z.string().nullable(),
  endedAt: z.string().nullable(),
  cores: z.number().nullable(),
  coreHours: z.number().nullable(),
  errors: z.array(z.string()),
  /** The same job id twice in the file, or already recorded on that machine. */
  duplicate: z.enum(['in-file', 'recorded']).nullable(),
});
export type ImportRow = z.infer<typeof ImportRow>;

export const RunImportResult = z
  .object({
    dryRun: z.boolean(),
    committed: z.boolean(),
    columns: z.array(z.string()),
    mapping: z.record(z.string(), z.union([ImportField, z.literal('ignore')]).nullable()),
    /** Columns neither guessed nor mapped: map each to a field or "ignore". */
    unknownColumns: z.array(z.string()),
    /** Fields a run needs that no column (or default) gives. */
    missingFields: z.array(z.string()),
    rows: z.array(ImportRow),
    summary: z.object({ rows: z.number().int(), valid: z.number().int(), withErrors: z.number().int(), duplicates: z.number().int(), coreHours: z.number() }),
    ledger: z.object({ remaining: z.number(), after: z.number(), allowed: z.boolean(), overdraft: z.boolean() }),
    runIds: z.array(z.uuid()),
  })
  .meta({ id: 'RunImportResult' });
export type RunImportResult = z.infer<typeof RunImportResult>;

export interface ParsedImportRow {
  line: number;
  raw: Record<string, string>;
  input: RunInput | null;
  errors: string[];
}

export interface ParsedImport {
  columns: string[];
  mapping: Record<string, ImportField | 'ignore' | null>;
  unknownColumns: string[];
  missingFields: string[];
  /** A problem with the file as a whole (not CSV, no header, too many rows). */
  fileError: string | null;
  rows: ParsedImportRow[];
}

/** A date and time in a scheduler's export; without a zone it is read as UTC. */
export function parseSchedulerTime(text: string): string | null {
  const t = text.trim();
  const m = /^(\d{4})-(\d{2})-(\d{2})[T ](\d{2}):(\d{2})(?::(\d{2})(\.\d+)?)?(Z|[+-]\d{2}:?\d{2})?$/.exec(t);
  if (!m) return null;
  const zone = m[8] ? (m[8] === 'Z' ? 'Z' : m[8].replace(/^([+-]\d{2})(\d{2})$/, '$1:$2')) : 'Z';
  const iso = `${m[1]}-${m[2]}-${m[3]}T${m[4]}:${m[5]}:${m[6] ?? '00'}${m[7] ?? ''}${zone}`;
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return null;
  // Reject 2027-02-30 and the like, which Date would roll over.
  const roundTrip = new Date(`${m[1]}-${m[2]}-${m[3]}T00:00:00Z`);
  if (roundTrip.getUTCDate() !== Number(m[3]) || roundTrip.getUTCMonth() + 1 !== Number(m[2])) return null;
  return d.toISOString();
}

/** Seconds from `3600`, `12:00:00` or `1-02:00:00` (days-hours:minutes:seconds). */
export function parseElapsed(text: string): number | null {
  const t = text.trim();
  if (/^\d+(\.\d+)?$/.test(t)) return Number(t);
  const m = /^(?:(\d+)-)?(\d{1,3}):(\d{2})(?::(\d{2}))?$/.exec(t);
  if (!m) return null;
  const [days, a, b, c] = [Number(m[1] ?? 0), Number(m[2]), Number(m[3]), m[4] === undefined ? null : Number(m[4])];
  if (b >= 60 || (c !== null && c >= 60)) return null;
  if (c !== null) return days * 86_400 + a * 3600 + b * 60 + c;
  // Two parts are D-HH:MM after a day count (the day must not be dropped), else MM:SS.
  return m[1] !== undefined ? days * 86_400 + a * 3600 + b * 60 : a * 60 + b;
}

const splitList = (text: string) => text.split(/[\s;|]+/).filter(Boolean);

function numberList(text: string, integer: boolean, label: string, errors: string[]): number[] {
  const values = splitList(text).map(Number);
  if (values.some((v) => !Number.isFinite(v) || (integer && !Number.isInteger(v)))) {
    errors.push(`${label} "${text}" is not a list of ${integer ? 'whole numbers' : 'numbers'} (separate values with spaces or ;)`);
    return [];
  }
  return values;
}

/**
 * Read an accounting CSV into run inputs, one result per row, nothing thrown for bad rows.
 * `machine` is the campaign's machine, used when the file has no machine column.
 */
export function parseRunImport(request: RunImportRequest, machine: string): ParsedImport {
  const empty = (fileError: string): ParsedImport => ({ columns: [], mapping: {}, unknownColumns: [], missingFields: [], fileError, rows: [] });
  let records: string[][];
  // The line each record starts on: blank lines are skipped and quoted cells may span lines,
  // so the record's index alone would point people at the wrong line.
  const startLines: number[] = [];
  try {
    // One kind of line break, so the reader's line numbers match what people see (spreadsheets write CRLF,
    // also inside quoted cells).
    const parsed = parse(request.csv.replace(/\r\n?/g, '\n'), { bom: true, skip_empty_lines: true, relax_column_count: true, trim: true, info: true }) as unknown as {
      record: string[];
      info: { lines: number; empty_lines: number };
    }[];
    let previous = { lines: 0, empty_lines: 0 };
    for (const { info } of parsed) {
      startLines.push(previous.lines + 1 + info.empty_lines - previous.empty_lines);
      previous = info;
    }
    records = parsed.map((r) => r.record);
  } catch (e) {
    return empty(`The file is not a readable CSV: ${(e as Error).message}`);
  }
  if (records.length < 2) return empty('The CSV needs a header line and at least one row.');
  if (records.length - 1 > MAX_IMPORT_ROWS) return empty(`The CSV has ${records.length - 1} rows; import at most ${MAX_IMPORT_ROWS} at a time.`);
  const columns = records[0];
  if (new Set(columns).size !== columns.length) return empty('Two columns have the same name; rename one.');

  // No prototype: a column named "constructor" or "__proto__" is a column like any other.
  const mapping: ParsedImport['mapping'] = Object.create(null) as ParsedImport['mapping'];
  const taken = new Set<ImportField>(Object.values(request.mapping ?? {}).filter((v): v is ImportField => v !== 'ignore'));
  for (const column of columns) {
    const given = request.mapping && Object.hasOwn(request.mapping, column) ? request.mapping[column] : undefined;
    if (given) {
      mapping[column] = given;
      continue;
    }
    const guess = IMPORT_FIELDS.find((f) => !taken.has(f) && HEADER_SYNONYMS[f].includes(normalise(column)));
    if (guess) taken.add(guess);
    mapping[column] = guess ?? null;
  }
  const unknownColumns = columns.filter((c) => mapping[c] === null);
  const mapped = new Set(Object.values(mapping));
  const missingFields: string[] = [];
  if (!mapped.has('externalJobId')) missingFields.push('externalJobId');
  if (!mapped.has('startedAt')) missingFields.push('startedAt');
  if (!mapped.has('endedAt') && !mapped.has('elapsedSeconds')) missingFields.push('endedAt or elapsedSeconds');
  if (!mapped.has('cores')) missingFields.push('cores');
  if (!mapped.has('codeName') && !request.defaults?.codeName) missingFields.push('codeName');
  if (!mapped.has('codeVersion') && !request.defaults?.codeVersion) missingFields.push('codeVersion');
  const fieldsMappedTwice = IMPORT_FIELDS.filter((f) => Object.values(mapping).filter((v) => v === f).length > 1);
  if (fieldsMappedTwice.length) return { ...empty(`More than one column is mapped to ${fieldsMappedTwice.join(', ')}; map each field once.`), columns, mapping, unknownColumns };

  const rows = records.slice(1).map((cells, i): ParsedImportRow => {
    const line = startLines[i + 1];
    const raw: Record<string, string> = Object.create(null) as Record<string, string>;
    columns.forEach((c, k) => (raw[c] = cells[k] ?? ''));
    const errors: string[] = [];
    if (cells.length !== columns.length) errors.push(`has ${cells.length} cells; the header has ${columns.length}`);
    const value = (f: ImportField) => {
      const column = columns.find((c) => mapping[c] === f);
      return column === undefined ? undefined : raw[column];
    };
    const startedAt = value('startedAt') ? parseSchedulerTime(value('startedAt')!) : null;
    if (value('startedAt') !== undefined && !startedAt) errors.push(`start "${value('startedAt')}" is not a date and time like 2027-02-01T08:00:00`);
    let endedAt: string | null = null;
    // Set when a message above already says why there is no end, so the schema's is not repeated.
    let endExplained = false;
    if (value('endedAt')) {
      endedAt = parseSchedulerTime(value('endedAt')!);
      if (!endedAt) errors.push(`end "${value('endedAt')}" is not a date and time like 2027-02-01T20:00:00`);
      endExplained = !endedAt;
    } else if (value('elapsedSeconds')) {
      const seconds = parseElapsed(value('elapsedSeconds')!);
      if (seconds === null) errors.push(`elapsed "${value('elapsedSeconds')}" is neither seconds nor [D-]HH:MM:SS`);
      else if (startedAt) endedAt = new Date(new Date(startedAt).getTime() + seconds * 1000).toISOString();
      endExplained = !endedAt;
    }
    const numberOrText = (f: ImportField) => {
      const v = value(f);
      if (v === undefined || v === '') return undefined;
      const n = Number(v);
      return Number.isFinite(n) ? n : v;
    };
    const candidate = {
      externalJobId: value('externalJobId') ?? '',
      machine: value('machine') || machine,
      startedAt: startedAt ?? undefined,
      endedAt: endedAt ?? undefined,
      cores: numberOrText('cores'),
      coreHours: numberOrText('coreHours'),
      codeName: value('codeName') || request.defaults?.codeName || '',
      codeVersion: value('codeVersion') || request.defaults?.codeVersion || '',
      parameters: {
        sizes: value('sizes') ? numberList(value('sizes')!, true, 'sizes', errors) : [],
        disorder: value('disorder') ? numberList(value('disorder')!, false, 'disorder', errors) : [],
        energies: value('energies') ? numberList(value('energies')!, false, 'energies', errors) : [],
        seeds: value('seeds') ? numberList(value('seeds')!, true, 'seeds', errors) : [],
      },
    };
    const parsed = RunInput.safeParse(candidate);
    if (!parsed.success) {
      for (const issue of parsed.error.issues) {
        const field = String(issue.path[0] ?? '');
        // Dates already have their own message from the scheduler's format.
        if ((field === 'startedAt' && value('startedAt') !== undefined && !startedAt) || (field === 'endedAt' && endExplained)) continue;
        errors.push(`${field ? `${field}: ` : ''}${issue.message}`);
      }
    }
    return { line, raw, input: parsed.success && !errors.length ? parsed.data : null, errors };
  });
  return { columns, mapping, unknownColumns, missingFields, fileError: null, rows };
}
