import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { EXAMPLE_CAMPAIGN_SPEC, EstimateReportSchema } from '@localis/shared';
import { runCli, tempConfigDir } from '../../test/cli-harness';

// Offline: no api, no sign-in. Every run points LOCALIS_URL at a port where nothing listens, so a
// stray call to the portal would fail the test rather than pass by luck.
const OFFLINE = { LOCALIS_URL: 'http://127.0.0.1:4' };

const SPEC = EXAMPLE_CAMPAIGN_SPEC;

let config: ReturnType<typeof tempConfigDir>;
beforeEach(() => {
  config = tempConfigDir();
});
afterEach(() => config.remove());

/** Writes a file into the test's own folder and returns its path. */
function file(name: string, content: string | object): string {
  const path = join(config.dir, name);
  writeFileSync(path, typeof content === 'string' ? content : JSON.stringify(content, null, 2));
  return path;
}

const estimate = (args: string[], input?: string) => runCli(['estimate', ...args], { configDir: config.dir, input, env: OFFLINE });

describe('localis estimate', () => {
  describe('--json', () => {
    it('should print one JSON object with the total, a row per size and the notices when the spec is valid', async () => {
      const r = await estimate([file('spec.json', SPEC), '--json']);
      expect(r.code, r.stderr).toBe(0);
      expect(r.stderr).toBe('');
      const report = EstimateReportSchema.parse(JSON.parse(r.stdout));
      expect(report.rows.map((row) => row.size)).toEqual([6, 8, 12, 16]);
      for (const row of report.rows) {
        expect(row).toEqual(expect.objectContaining({ points: 13, jobs: 13, fitsNode: true }));
        expect(row.operations).toBeGreaterThan(0);
        expect(row.peakMemoryBytes).toBeGreaterThan(0);
      }
      expect(report.totalCoreHours).toBeGreaterThan(0);
      expect(report.totalCoreHours).toBeCloseTo(report.rows.reduce((sum, row) => sum + row.coreHours, 0), 9);
      expect(report.notices).toEqual([]);
      expect(report).toMatchObject({ rate: { source: 'default' } });
    });

    it('should list notices with code, severity and message when the plan has a problem', async () => {
      const r = await estimate([file('spec.json', { ...SPEC, dimension: 1, sizes: [16, 24] }), '--json']);
      expect(r.code, r.stderr).toBe(0);
      const { notices } = EstimateReportSchema.parse(JSON.parse(r.stdout));
      expect(notices).toEqual(
        expect.arrayContaining([
          expect.objectContaining({ code: 'no-transition-1d', severity: 'warning', message: expect.stringContaining('one dimension') }),
          expect.objectContaining({ code: 'too-few-sizes', severity: 'warning' }),
        ]),
      );
    });

    it('should read the spec from standard input when it is given as -', async () => {
      const r = await estimate(['-', '--json'], JSON.stringify(SPEC));
      expect(r.code, r.stderr).toBe(0);
      expect(JSON.parse(r.stdout).rows).toHaveLength(4);
    });
  });

  describe('human output', () => {
    it('should show a row per size, the total matching --json, the rate and the assumptions', async () => {
      const spec = file('spec.json', SPEC);
      const { totalCoreHours } = JSON.parse((await estimate([spec, '--json'])).stdout) as { totalCoreHours: number };
      const r = await estimate([spec]);
      expect(r.code, r.stderr).toBe(0);
      expect(r.stdout).toMatch(/^\s+L\s+points\s+jobs\s+operations\/job\s+core-hours\s+share\s+peak memory\s+fits node$/m);
      for (const size of [6, 8, 12, 16]) expect(r.stdout).toMatch(new RegExp(`^\\s+${size}\\s+13\\s+13\\s.*\\s(KiB|MiB)\\s+yes$`, 'm'));
      const total = /^Total: ([\d,.]+) core-hours$/m.exec(r.stdout);
      expect(total, r.stdout).not.toBeNull();
      expect(Number(total![1].replace(/,/g, '')) / totalCoreHours).toBeCloseTo(1, 2);
      expect(r.stdout).toContain('Rate: default, 1.0 GFLOP/s sustained per core');
      expect(r.stdout).toContain('Assumptions:\n  - No pilot timings');
      expect(r.stdout).toContain('Notices: none');
    });

    it('should mark each notice as warning or info when there are notices', async () => {
      const r = await estimate([file('spec.json', { ...SPEC, disorder: { from: 10, to: 12, step: 0.5 } })]);
      expect(r.code, r.stderr).toBe(0);
      expect(r.stdout).toMatch(/^ {2}\[warning\] The disorder grid .* \(grid-misses-critical-disorder\)$/m);
    });

    it('should say "no" and name the sizes when a job does not fit the node', async () => {
      const r = await estimate([file('spec.json', { ...SPEC, method: 'exact-diagonalization', sizes: [10, 60] })]);
      expect(r.code, r.stderr).toBe(0);
      expect(r.stdout).toMatch(/^\s+60\s.*GiB\s+no$/m);
      expect(r.stdout).toContain('a node has 256 GiB, too little at L = 60');
    });
  });

  describe('--pilot', () => {
    const PILOT = 'size,seconds,cores\n4,10.2,1\n6,120,1\n8,350,2\n';

    it('should switch the rate to the pilot fit with its R² when a pilot CSV is given', async () => {
      const spec = file('spec.json', SPEC);
      const pilot = file('timings.csv', PILOT);
      const json = await estimate([spec, '--pilot', pilot, '--json']);
      expect(json.code, json.stderr).toBe(0);
      const report = JSON.parse(json.stdout);
      expect(report.rate).toMatchObject({ source: 'pilot', fit: { points: 3, sizeRange: { min: 4, max: 8 } } });
      expect(report.rate.fit.rSquared).toBeGreaterThan(0.9);

      const human = await estimate([spec, '--pilot', pilot]);
      expect(human.code, human.stderr).toBe(0);
      expect(human.stdout).toMatch(/^Rate: pilot fit of 3 timings \(L from 4 to 8\): core-seconds per job = \S+ × L\^\d+\.\d\d, R² = \d\.\d{3}/m);
      expect(human.stdout).not.toContain('Rate: default');
    });

    it('should exit 2 and name the missing column when the pilot CSV lacks one', async () => {
      const r = await estimate([file('spec.json', SPEC), '--pilot', file('timings.csv', 'size,seconds\n4,10\n8,90\n')]);
      expect(r.code).toBe(2);
      expect(r.stdout).toBe('');
      expect(r.stderr).toContain('the pilot timings in');
      expect(r.stderr).toMatch(/^ {2}pilotTimings: .*missing: cores/m);
    });

    it('should exit 2 with the line of each bad value when pilot rows are wrong', async () => {
      const r = await estimate([file('spec.json', SPEC), '--pilot', file('timings.csv', 'size,seconds,cores\n4,10,1\n8,-5,x\n')]);
      expect(r.code).toBe(2);
      expect(r.stderr).toContain('  pilotTimings[1].seconds: line 3: seconds must be greater than 0');
      expect(r.stderr).toContain('  pilotTimings[1].cores: line 3: cores must be a number (read "x")');
    });
  });

  describe('an invalid spec', () => {
    it.each([
      ['a step of 0', { disorder: { from: 15, to: 18, step: 0 } }, 'disorder.step: step must be greater than 0'],
      ['a reversed grid', { disorder: { from: 18, to: 15, step: 0.25 } }, 'disorder.to: to (15) must not be below from (18)'],
      ['a size of 0', { sizes: [0] }, 'sizes[0]: sizes must be positive integers'],
      ['an unknown method', { method: 'quantum-annealing' }, 'method: method must be one of: transfer-matrix'],
      ['a precision of 1.5', { targetPrecision: 1.5 }, 'targetPrecision: target precision must be between 0 and 1'],
    ])('should exit 2 and print the field path on stderr when the spec has %s', async (_, change, line) => {
      const r = await estimate([file('spec.json', { ...SPEC, ...change }), '--json']);
      expect(r.code).toBe(2);
      expect(r.stdout).toBe('');
      expect(r.stderr).toContain('is not a valid campaign spec:');
      expect(r.stderr).toContain(`\n  ${line}`);
    });

    it('should list every problem, each on its own line, when there are several', async () => {
      const r = await estimate([file('spec.json', { ...SPEC, sizes: [0], method: 'quantum-annealing', targetPrecision: 1.5, disorder: { from: 15, to: 18, step: 0 } })]);
      expect(r.code).toBe(2);
      expect(r.stdout).toBe('');
      for (const path of ['sizes[0]', 'method', 'targetPrecision', 'disorder.step']) expect(r.stderr).toMatch(new RegExp(`^  ${path.replace(/[[\].]/g, '\\$&')}: `, 'm'));
    });

    it('should exit 2 and say so when the file holds an array rather than an object', async () => {
      const r = await estimate([file('spec.json', [SPEC])]);
      expect(r.code).toBe(2);
      expect(r.stderr).toContain('holds an array, not a campaign spec');
    });
  });

  describe('unreadable input', () => {
    it('should exit 2 with the line and column when the file is not JSON', async () => {
      const r = await estimate([file('spec.json', '{\n  "model": "anderson-box",\n  "sizes": [6, 8,]\n}\n')]);
      expect(r.code).toBe(2);
      expect(r.stdout).toBe('');
      expect(r.stderr).toMatch(/spec\.json is not valid JSON: line 3, column 18: /);
    });

    it('should exit 2 with a position when the text is not JSON at all', async () => {
      const r = await estimate([file('spec.yaml', 'model: anderson-box\n')]);
      expect(r.code).toBe(2);
      expect(r.stderr).toContain('is not valid JSON: line 1, column 1: expected a value');
      expect(r.stderr).toContain('found "model"');
    });

    it('should exit 1 and say the file does not exist when it is missing', async () => {
      const r = await estimate([join(config.dir, 'no-such-spec.json')]);
      expect(r.code).toBe(1);
      expect(r.stdout).toBe('');
      expect(r.stderr).toMatch(/^localis: cannot read the campaign spec .*no-such-spec\.json: no such file\.$/m);
    });

    it('should exit 1 when the pilot CSV is missing', async () => {
      const r = await estimate([file('spec.json', SPEC), '--pilot', join(config.dir, 'no-such.csv')]);
      expect(r.code).toBe(1);
      expect(r.stderr).toContain('cannot read the pilot-timings CSV');
    });

    it('should exit 2 when no spec is given', async () => {
      const r = await estimate([]);
      expect(r.code).toBe(2);
      expect(r.stderr).toContain("missing required argument 'spec'");
    });
  });
});
