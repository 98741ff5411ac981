import { describe, expect, it } from 'vitest';
import { MAX_PROBLEMS_PER_TABLE, NumericTableReader, type TablePoint } from './numeric-table';
import { ProblemList } from './problem-list';
import { specBounds } from './spec-bounds';

function readTable(text: string | Buffer, options: { chunk?: number; maxRows?: number; bounds?: ReturnType<typeof specBounds>; collect?: number } = {}) {
  const problems = new ProblemList();
  const points: TablePoint[] = [];
  const reader = new NumericTableReader({
    path: 'results/t.csv',
    maxRows: options.maxRows ?? 1000,
    problems,
    bounds: options.bounds,
    collect: options.collect ? (p) => points.push(p) < options.collect! : undefined,
  });
  const bytes = Buffer.isBuffer(text) ? text : Buffer.from(text);
  const step = options.chunk ?? bytes.length;
  for (let at = 0; at < bytes.length; at += step) reader.write(bytes.subarray(at, at + step));
  return { summary: reader.end(), problems: problems.list(), points };
}

const GOOD = 'L,W,E,lambda,lambda_err\n6,15,0,0.81,0.002\n8,15.5,0,0.74,0.0015\n10,16,0.5,0.66,0.001\n';

describe('NumericTableReader', () => {
  it('summarises a good lambda table', () => {
    const { summary, problems } = readTable(GOOD);
    expect(problems).toEqual([]);
    expect(summary).toEqual({ path: 'results/t.csv', kind: 'lambda', rows: 3, sizes: [6, 8, 10], disorderMin: 15, disorderMax: 16, energies: [0, 0.5] });
  });

  it('gives the same answer whatever the chunk boundaries (one byte at a time, odd sizes)', () => {
    const text = 'L,W,E,g,g_err,note\r\n6,15,0,-1.25,0.01,first run\r\n\r\n8,16,0,-2.5e-1,1e-3,"quoted, extra"\r\n10,17,0,-3,0';
    const whole = readTable(text);
    expect(whole.problems).toEqual([]);
    expect(whole.summary?.kind).toBe('g');
    expect(whole.summary?.rows).toBe(3);
    for (const chunk of [1, 2, 3, 7, 13]) expect(readTable(text, { chunk })).toEqual(whole);
  });

  it('accepts a byte-order mark, extra columns and a missing final newline', () => {
    const { summary, problems } = readTable('\uFEFFL,W,E,lambda,lambda_err,seed\n6,15,0,0.8,0.01,17');
    expect(problems).toEqual([]);
    expect(summary?.rows).toBe(1);
  });

  it('refuses a header that does not begin with the columns, naming both forms', () => {
    const { summary, problems } = readTable('W,L,E,lambda,lambda_err\n15,6,0,0.8,0.01\n');
    expect(summary).toBeNull();
    expect(problems).toHaveLength(1);
    expect(problems[0]).toMatchObject({ code: 'table-invalid', path: 'results/t.csv' });
    expect(problems[0].message).toContain('L,W,E,lambda,lambda_err or L,W,E,g,g_err');
  });

  it('refuses an empty table', () => {
    expect(readTable('').problems[0].message).toContain('empty');
  });

  it.each([
    ['6,15,0,NaN,0.01', 'column lambda: "NaN" is not a plain finite number'],
    ['6,15,0,0.8,Infinity', 'column lambda_err: "Infinity" is not a plain finite number'],
    ['6,15,0,1e999,0.01', 'column lambda: the value is too large'],
    ['6.5,15,0,0.8,0.01', 'column L: 6.5 is not a whole number'],
    ['0,15,0,0.8,0.01', 'column L: 0 is not a whole number of at least 1'],
    ['6,15,0,0.8,-0.01', 'column lambda_err: an error bar cannot be negative'],
    ['6,15,0,0.8', 'the row has 4 columns'],
    ['6,,0,0.8,0.01', 'column W: the value is missing'],
    ['6,"15",0,0.8,0.01', 'column W: quoted values are not accepted'],
    ['6,15,zero,0.8,0.01', 'column E: "zero" is not a plain finite number'],
  ])('refuses %j with line and column', (row, message) => {
    const { problems, summary } = readTable(`L,W,E,lambda,lambda_err\n6,15,0,0.8,0.01\n${row}\n`);
    expect(problems).toHaveLength(1);
    expect(problems[0].code).toBe('table-invalid');
    expect(problems[0].message).toContain('results/t.csv: line 3');
    expect(problems[0].message).toContain(message);
    expect(summary?.rows).toBe(1);
  });

  it(`lists ${MAX_PROBLEMS_PER_TABLE} problems of a table, then says how many more`, () => {
    const rows = Array.from({ length: 50 }, (_, i) => `${i + 1},15,0,x,0.01`).join('\n');
    const { problems } = readTable(`L,W,E,lambda,lambda_err\n${rows}\n`);
    expect(problems).toHaveLength(MAX_PROBLEMS_PER_TABLE + 1);
    expect(problems.at(-1)!.message).toBe('results/t.csv: and 30 more problems in this table');
  });

  it('stops at the row limit', () => {
    const { problems } = readTable(GOOD, { maxRows: 2 });
    expect(problems).toHaveLength(1);
    expect(problems[0].message).toContain('more than 2 rows');
  });

  it('refuses a line longer than the limit without holding it', () => {
    const long = Buffer.concat([Buffer.from('L,W,E,lambda,lambda_err\n6,15,0,0.8,0.01,'), Buffer.alloc(1.5 * 1024 * 1024, 'x')]);
    const { problems } = readTable(long, { chunk: 64 * 1024 });
    expect(problems[0].message).toContain('line 2 is longer than 1 MiB');
  });

  it('counts rows outside the plan and reports them once per table', () => {
    const bounds = specBounds({ sizes: [6, 8], disorder: { from: 15, to: 16, step: 0.5 }, energies: [0] });
    const text = 'L,W,E,lambda,lambda_err\n6,15,0,0.8,0.01\n10,15,0,0.7,0.01\n12,15,0,0.7,0.01\n8,16.0000000001,1e-12,0.6,0.01\n8,16.5,0.25,0.6,0.01\n';
    const { problems } = readTable(text, { bounds });
    expect(problems).toHaveLength(1);
    expect(problems[0].code).toBe('outside-spec');
    expect(problems[0].message).toBe(
      "results/t.csv: points outside the campaign's plan: 2 rows with L not among the planned sizes 6, 8 (first at line 3: L = 10); 1 row with W outside 15 ≤ W ≤ 16 (first at line 6: W = 16.5); 1 row with E not among the planned energies 0 (first at line 6: E = 0.25)",
    );
  });

  it('hands over rows for the analysis up to the limit', () => {
    const { points } = readTable(GOOD, { collect: 2 });
    expect(points).toEqual([
      { kind: 'lambda', L: 6, W: 15, E: 0, value: 0.81, err: 0.002 },
      { kind: 'lambda', L: 8, W: 15.5, E: 0, value: 0.74, err: 0.0015 },
    ]);
  });
});
