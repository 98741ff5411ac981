import { describe, expect, it } from 'vitest';
import { MAX_IMPORT_ROWS, parseElapsed, parseRunImport, parseSchedulerTime, RunImportRequest, type RunImportRequest as Request } from './run-import';

/** A scheduler's accounting export as people download it: job name, partition and state included. */
const SCHEDULER_HEADER = 'JobID,JobName,Partition,Start,End,AllocCPUS,Elapsed,State';
const schedulerCsv = (...rows: string[]) => [SCHEDULER_HEADER, ...rows].join('\n') + '\n';
const COMPLETED = '4711,tmm,compute,2027-02-01T08:00:00,2027-02-01T20:00:00,128,12:00:00,COMPLETED';

const IGNORE_EXTRAS = { Partition: 'ignore', State: 'ignore' } as const;
const importOf = (request: Partial<Request> & { csv: string }, machine = 'cluster-a') => parseRunImport(request, machine);
/** The errors of the only row of a CSV. */
const rowErrors = (csv: string, request: Partial<Request> = {}) => {
  const parsed = importOf({ csv, defaults: { codeVersion: '1.4.2' }, ...request });
  expect(parsed.fileError).toBeNull();
  expect(parsed.rows).toHaveLength(1);
  return parsed.rows[0].errors;
};

describe('parseRunImport', () => {
  describe('header guessing', () => {
    it('should map the usual scheduler columns and report Partition and State as unknown when nothing maps them', () => {
      const parsed = importOf({ csv: schedulerCsv(COMPLETED) });
      expect({ ...parsed.mapping }).toEqual({
        JobID: 'externalJobId',
        JobName: 'codeName',
        Partition: null,
        Start: 'startedAt',
        End: 'endedAt',
        AllocCPUS: 'cores',
        Elapsed: 'elapsedSeconds',
        State: null,
      });
      expect(parsed.unknownColumns).toEqual(['Partition', 'State']);
      expect(parsed.columns).toEqual(SCHEDULER_HEADER.split(','));
    });

    it('should stop reporting Partition and State once they are mapped to "ignore"', () => {
      const parsed = importOf({ csv: schedulerCsv(COMPLETED), mapping: IGNORE_EXTRAS, defaults: { codeVersion: '1.4.2' } });
      expect(parsed.unknownColumns).toEqual([]);
      expect(parsed.mapping).toMatchObject(IGNORE_EXTRAS);
      expect(parsed.missingFields).toEqual([]);
    });

    it('should compare headers without case, spaces or punctuation', () => {
      const parsed = importOf({ csv: 'Job ID,start_time,END-TIME,N CPUs,Code Version,code name\n1,2027-02-01T08:00:00,2027-02-01T09:00:00,4,2.0,tmm\n' });
      expect({ ...parsed.mapping }).toEqual({
        'Job ID': 'externalJobId',
        start_time: 'startedAt',
        'END-TIME': 'endedAt',
        'N CPUs': 'cores',
        'Code Version': 'codeVersion',
        'code name': 'codeName',
      });
      expect(parsed.rows[0].errors).toEqual([]);
    });

    it('should guess a field once and report a second column of the same kind as unknown', () => {
      const parsed = importOf({ csv: 'JobID,JobIDRaw,Start,End,AllocCPUS\n1,1,2027-02-01T08:00:00,2027-02-01T09:00:00,4\n' });
      expect(parsed.mapping).toMatchObject({ JobID: 'externalJobId', JobIDRaw: null });
      expect(parsed.unknownColumns).toEqual(['JobIDRaw']);
    });

    it('should report a column named like an object property as unknown, like any other name', () => {
      const parsed = importOf({ csv: `${SCHEDULER_HEADER},constructor\n${COMPLETED},x\n`, mapping: IGNORE_EXTRAS });
      expect(parsed.unknownColumns).toEqual(['constructor']);
      expect(parsed.mapping.constructor).toBeNull();
    });

    it('should name the fields no column gives, and accept defaults for code name and version instead', () => {
      const parsed = importOf({ csv: 'Start,Walltime\n2027-02-01T08:00:00,3600\n' });
      expect(parsed.missingFields).toEqual(['externalJobId', 'cores', 'codeName', 'codeVersion']);
      const withDefaults = importOf({ csv: 'JobID,Start,Walltime,NCPUS\n1,2027-02-01T08:00:00,3600,4\n', defaults: { codeName: 'tmm', codeVersion: '1.4.2' } });
      expect(withDefaults.missingFields).toEqual([]);
      expect(withDefaults.rows[0].input).toMatchObject({ codeName: 'tmm', codeVersion: '1.4.2' });
    });

    it('should ask for an end or an elapsed time when the file has neither', () => {
      expect(importOf({ csv: 'JobID,Start,NCPUS\n1,2027-02-01T08:00:00,4\n' }).missingFields).toContain('endedAt or elapsedSeconds');
    });
  });

  describe('explicit mapping', () => {
    it('should use the given mapping over the guess and not guess that field for another column', () => {
      const parsed = importOf({
        csv: 'JobID,JobName,Comment,Start,End,AllocCPUS\n1,nightly,tmm,2027-02-01T08:00:00,2027-02-01T09:00:00,4\n',
        mapping: { Comment: 'codeName', JobName: 'ignore' },
        defaults: { codeVersion: '2.0' },
      });
      expect(parsed.mapping).toMatchObject({ JobName: 'ignore', Comment: 'codeName' });
      expect(parsed.rows[0].input).toMatchObject({ codeName: 'tmm', codeVersion: '2.0' });
    });

    it('should prefer a column over the default when both give the code name', () => {
      const parsed = importOf({ csv: schedulerCsv(COMPLETED), mapping: IGNORE_EXTRAS, defaults: { codeName: 'other', codeVersion: '1' } });
      expect(parsed.rows[0].input?.codeName).toBe('tmm');
    });

    it('should fall back to the default for a row whose code cell is empty', () => {
      const parsed = importOf({ csv: schedulerCsv(COMPLETED.replace(',tmm,', ',,')), mapping: IGNORE_EXTRAS, defaults: { codeName: 'tmm', codeVersion: '1' } });
      expect(parsed.rows[0].input?.codeName).toBe('tmm');
    });

    it('should refuse the file when two columns are mapped to the same field', () => {
      const parsed = importOf({ csv: schedulerCsv(COMPLETED), mapping: { Partition: 'machine', State: 'machine' } });
      expect(parsed.fileError).toBe('More than one column is mapped to machine; map each field once.');
      expect(parsed.rows).toEqual([]);
      expect(parsed.columns).toEqual(SCHEDULER_HEADER.split(','));
    });

    it('should refuse a mapping to something that is not a run field when the request is checked', () => {
      const result = RunImportRequest.safeParse({ csv: 'a\n1', mapping: { a: 'nodes' } });
      expect(result.success).toBe(false);
      expect(result.error?.issues[0].path).toEqual(['mapping', 'a']);
    });
  });

  describe('a typical export', () => {
    it('should read the worked example: 128 cores for 12 h, times without a zone read as UTC', () => {
      const parsed = importOf({ csv: schedulerCsv(COMPLETED), mapping: IGNORE_EXTRAS, defaults: { codeVersion: '1.4.2' } });
      expect(parsed.rows).toEqual([
        {
          line: 2,
          raw: expect.objectContaining({ JobID: '4711', State: 'COMPLETED' }),
          errors: [],
          input: {
            externalJobId: '4711',
            machine: 'cluster-a',
            startedAt: '2027-02-01T08:00:00.000Z',
            endedAt: '2027-02-01T20:00:00.000Z',
            cores: 128,
            codeName: 'tmm',
            codeVersion: '1.4.2',
            parameters: { sizes: [], disorder: [], energies: [], seeds: [] },
          },
        },
      ]);
    });

    it('should take the machine from a machine column when the file has one', () => {
      const parsed = importOf({ csv: 'JobID,Cluster,Start,End,NCPUS\n1,cluster-b,2027-02-01T08:00:00,2027-02-01T09:00:00,4\n', defaults: { codeName: 'tmm', codeVersion: '1' } });
      expect(parsed.rows[0].input?.machine).toBe('cluster-b');
    });

    it('should read the lists of sizes, disorder, energies and seeds separated by spaces, ; or |', () => {
      const parsed = importOf({ csv: 'JobID,Start,End,NCPUS,Code,Version,L,W,E,Seed\n7,2027-02-01T08:00:00,2027-02-01T09:00:00,8,tmm,2,12 16,16.5;17,0,1|2\n' });
      expect(parsed.rows[0].errors).toEqual([]);
      expect(parsed.rows[0].input?.parameters).toEqual({ sizes: [12, 16], disorder: [16.5, 17], energies: [0], seeds: [1, 2] });
    });

    it('should explain lists that are not numbers or not whole numbers', () => {
      const errors = rowErrors('JobID,Start,End,NCPUS,Code,L,W\n7,2027-02-01T08:00:00,2027-02-01T09:00:00,8,tmm,12.5,x\n');
      expect(errors).toEqual([
        'sizes "12.5" is not a list of whole numbers (separate values with spaces or ;)',
        'disorder "x" is not a list of numbers (separate values with spaces or ;)',
      ]);
    });

    it('should pass the schema\'s message on for list values out of range', () => {
      expect(rowErrors('JobID,Start,End,NCPUS,Code,Seed\n7,2027-02-01T08:00:00,2027-02-01T09:00:00,8,tmm,-1\n')).toEqual(['parameters: seeds are not negative']);
    });
  });

  describe('elapsed times', () => {
    const withElapsed = (elapsed: string) =>
      importOf({ csv: `JobID,Start,Elapsed,NCPUS\n1,2027-02-01T08:00:00,${elapsed},4\n`, defaults: { codeName: 'tmm', codeVersion: '1' } }).rows[0];

    it('should add HH:MM:SS, D-HH:MM:SS and seconds to the start when there is no end column', () => {
      expect(withElapsed('12:00:00').input?.endedAt).toBe('2027-02-01T20:00:00.000Z');
      expect(withElapsed('1-02:30:00').input?.endedAt).toBe('2027-02-02T10:30:00.000Z');
      expect(withElapsed('3600').input?.endedAt).toBe('2027-02-01T09:00:00.000Z');
    });

    it('should explain an elapsed time it cannot read', () => {
      expect(withElapsed('soon').errors).toEqual(['elapsed "soon" is neither seconds nor [D-]HH:MM:SS']);
    });

    it('should refuse an elapsed time of 0 as a run that does not end after it starts', () => {
      expect(withElapsed('0').errors).toEqual(['endedAt: a run must end after it starts']);
    });
  });

  describe('row errors', () => {
    it('should refuse a date that does not exist, such as 2027-02-30', () => {
      const errors = rowErrors(schedulerCsv(COMPLETED.replace('2027-02-01T08:00:00', '2027-02-30T08:00:00')), { mapping: IGNORE_EXTRAS });
      expect(errors).toEqual(['start "2027-02-30T08:00:00" is not a date and time like 2027-02-01T08:00:00']);
    });

    it('should refuse the end "Unknown" a scheduler writes for a job still running, once, in its own words', () => {
      const errors = rowErrors(schedulerCsv(COMPLETED.replace('2027-02-01T20:00:00', 'Unknown')), { mapping: IGNORE_EXTRAS });
      expect(errors).toEqual(['end "Unknown" is not a date and time like 2027-02-01T20:00:00']);
    });

    it('should refuse a run that ends before it starts at its end', () => {
      const errors = rowErrors(schedulerCsv(COMPLETED.replace('2027-02-01T20:00:00', '2027-02-01T07:00:00')), { mapping: IGNORE_EXTRAS });
      expect(errors).toEqual(['endedAt: a run must end after it starts']);
    });

    it('should refuse negative, fractional and non-numeric cores', () => {
      const withCores = (cores: string) => rowErrors(schedulerCsv(COMPLETED.replace(',128,', `,${cores},`)), { mapping: IGNORE_EXTRAS });
      expect(withCores('-4')).toEqual(['cores: a run uses at least 1 core']);
      expect(withCores('2.5')).toEqual(['cores: cores is a whole number']);
      expect(withCores('four')).toEqual(['cores: cores must be a number']);
      expect(withCores('')).toEqual(['cores: cores must be a number']);
    });

    it('should report a row with fewer or more cells than the header', () => {
      const parsed = importOf({ csv: schedulerCsv('4712,tmm,compute,2027-02-01T08:00:00,2027-02-01T20:00:00,128', `${COMPLETED},extra`), mapping: IGNORE_EXTRAS, defaults: { codeVersion: '1' } });
      expect(parsed.rows[0].errors).toContain('has 6 cells; the header has 8');
      expect(parsed.rows[1].errors).toContain('has 9 cells; the header has 8');
      expect(parsed.rows.map((r) => r.input)).toEqual([null, null]);
    });

    it('should still say the end is missing when the row has another error too', () => {
      const errors = rowErrors('JobID,Start,End,NCPUS,Code,L\n7,2027-02-01T08:00:00,,8,tmm,x\n');
      expect(errors).toEqual(['sizes "x" is not a list of whole numbers (separate values with spaces or ;)', 'endedAt: endedAt must be a date and time, e.g. 2027-02-01T20:00:00Z']);
    });

    it('should keep good rows good when others in the file are bad', () => {
      const parsed = importOf({ csv: schedulerCsv(COMPLETED, COMPLETED.replace('4711', '4712').replace(',128,', ',-1,')), mapping: IGNORE_EXTRAS, defaults: { codeVersion: '1' } });
      expect(parsed.rows.map((r) => [r.line, r.input !== null])).toEqual([
        [2, true],
        [3, false],
      ]);
    });

    it('should give each row the line it starts on when blank lines and cells spanning lines come before it', () => {
      const parsed = importOf({
        csv: `${SCHEDULER_HEADER}\n${COMPLETED}\n\n\n4712,"tmm\nnightly",compute,2027-02-01T08:00:00,2027-02-01T20:00:00,128,12:00:00,COMPLETED\n4713,tmm,compute,2027-02-01T08:00:00,2027-02-01T20:00:00,-1,12:00:00,FAILED\n`,
        mapping: IGNORE_EXTRAS,
        defaults: { codeVersion: '1' },
      });
      expect(parsed.rows.map((r) => [r.line, r.raw.JobID])).toEqual([
        [2, '4711'],
        [5, '4712'],
        [7, '4713'],
      ]);
    });
  });

  describe('the file as a whole', () => {
    it('should refuse two columns with the same name', () => {
      const parsed = importOf({ csv: 'JobID,Start,Start,NCPUS\n1,2027-02-01T08:00:00,2027-02-01T08:00:00,4\n' });
      expect(parsed.fileError).toBe('Two columns have the same name; rename one.');
      expect(parsed.rows).toEqual([]);
    });

    it('should refuse a file with only a header', () => {
      expect(importOf({ csv: `${SCHEDULER_HEADER}\n` }).fileError).toBe('The CSV needs a header line and at least one row.');
    });

    it('should refuse text that is not CSV, naming the reason', () => {
      expect(importOf({ csv: 'JobID,Start\n"1,2027-02-01\n' }).fileError).toMatch(/^The file is not a readable CSV: /);
    });

    it(`should accept ${MAX_IMPORT_ROWS} rows and refuse one more`, () => {
      const rows = (n: number) => Array.from({ length: n }, (_, i) => `${i + 1},tmm,2027-02-01T08:00:00,2027-02-01T09:00:00,4`).join('\n');
      const request = (n: number) => ({ csv: `JobID,JobName,Start,End,AllocCPUS\n${rows(n)}\n`, defaults: { codeVersion: '1' } });
      const atLimit = importOf(request(MAX_IMPORT_ROWS));
      expect(atLimit.fileError).toBeNull();
      expect(atLimit.rows).toHaveLength(MAX_IMPORT_ROWS);
      expect(atLimit.rows.every((r) => r.input !== null)).toBe(true);
      expect(importOf(request(MAX_IMPORT_ROWS + 1)).fileError).toBe(`The CSV has ${MAX_IMPORT_ROWS + 1} rows; import at most ${MAX_IMPORT_ROWS} at a time.`);
      // Checking 20 000 rows takes a second or two, longer beside the other suites.
    }, 30_000);

    it('should read a file saved with a byte-order mark and Windows line ends', () => {
      const parsed = importOf({ csv: `\uFEFF${SCHEDULER_HEADER}\r\n${COMPLETED}\r\n`, mapping: IGNORE_EXTRAS, defaults: { codeVersion: '1' } });
      expect(parsed.columns[0]).toBe('JobID');
      expect(parsed.rows[0].errors).toEqual([]);
    });
  });
});

describe('parseSchedulerTime', () => {
  it('should read a time without a zone as UTC, with a T or a space, with or without seconds', () => {
    expect(parseSchedulerTime('2027-02-01T08:00:00')).toBe('2027-02-01T08:00:00.000Z');
    expect(parseSchedulerTime('2027-02-01 08:00')).toBe('2027-02-01T08:00:00.000Z');
  });

  it('should honour a zone written as Z, +01:00 or +0100', () => {
    expect(parseSchedulerTime('2027-02-01T08:00:00Z')).toBe('2027-02-01T08:00:00.000Z');
    expect(parseSchedulerTime('2027-02-01T09:00:00+01:00')).toBe('2027-02-01T08:00:00.000Z');
    expect(parseSchedulerTime('2027-02-01T09:00:00+0100')).toBe('2027-02-01T08:00:00.000Z');
  });

  it('should refuse dates that do not exist and words', () => {
    expect(parseSchedulerTime('2027-02-30T08:00:00')).toBeNull();
    expect(parseSchedulerTime('2027-02-29T08:00:00')).toBeNull();
    expect(parseSchedulerTime('2028-02-29T08:00:00')).toBe('2028-02-29T08:00:00.000Z');
    expect(parseSchedulerTime('2027-13-01T08:00:00')).toBeNull();
    expect(parseSchedulerTime('2027-02-01T25:00:00')).toBeNull();
    expect(parseSchedulerTime('Unknown')).toBeNull();
    expect(parseSchedulerTime('')).toBeNull();
  });
});

describe('parseElapsed', () => {
  it('should read seconds, MM:SS, HH:MM:SS and D-HH:MM:SS', () => {
    expect(parseElapsed('3600')).toBe(3600);
    expect(parseElapsed('90.5')).toBe(90.5);
    expect(parseElapsed('20:00')).toBe(1200);
    expect(parseElapsed('12:00:00')).toBe(43_200);
    expect(parseElapsed('1-02:00:00')).toBe(93_600);
    expect(parseElapsed('120:00:00')).toBe(432_000);
  });

  it('should keep the days of D-HH:MM', () => {
    expect(parseElapsed('1-02:00')).toBe(93_600);
  });

  it('should refuse minutes or seconds of 60 and more', () => {
    expect(parseElapsed('12:75:00')).toBeNull();
    expect(parseElapsed('00:00:60')).toBeNull();
  });

  it('should refuse what is not a duration', () => {
    for (const text of ['', 'soon', '-5', '1:2', '1-', '12:00:00:00']) expect(parseElapsed(text), text).toBeNull();
  });
});

describe('line numbers with spreadsheet line breaks', () => {
  it('should name the line a row starts on when a quoted cell spans CRLF lines', () => {
    const csv = 'JobID,JobName,Start,End,AllocCPUS\r\n1,"two\r\nlines",2027-02-01T08:00:00,2027-02-01T09:00:00,4\r\n2,tmm,2027-02-01T08:00:00,2027-02-01T09:00:00,4\r\n3,tmm,bad,2027-02-01T09:00:00,4\r\n';
    const parsed = parseRunImport({ csv, defaults: { codeVersion: 'v1' } }, 'cluster-a');
    expect(parsed.rows.map((r) => r.line)).toEqual([2, 4, 5]);
  });
});
