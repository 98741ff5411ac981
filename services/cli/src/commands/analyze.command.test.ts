import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { syntheticScalingTable, type ScalingPoint } from '@localis/shared';
import { runCli, tempConfigDir } from '../../test/cli-harness';

// Offline: no api, no sign-in. Every run points LOCALIS_URL at a port where nothing listens, so a
// stray call to the portal would fail the test rather than pass by luck.
const OFFLINE = { LOCALIS_URL: 'http://127.0.0.1:4' };

let config: ReturnType<typeof tempConfigDir>;
beforeEach(() => {
  config = tempConfigDir();
});
afterEach(() => config.remove());

/** Writes a file into the test's own folder and returns its path. */
function file(name: string, content: string): string {
  const path = join(config.dir, name);
  writeFileSync(path, content);
  return path;
}

const analyze = (args: string[], input?: string) => runCli(['analyze', ...args], { configDir: config.dir, input, env: OFFLINE });

/** A table drawn from a known scaling function: W_c = 16.5, nu = 1.57, Lambda_c = 0.576, 0.2 % noise. */
const WC = 16.5;
const NU = 1.57;
const XS = Array.from({ length: 13 }, (_, i) => 15 + 0.25 * i);
const synthetic = (sizes = [6, 8, 12, 16]) =>
  syntheticScalingTable({ criticalX: WC, nu: NU, criticalValue: 0.576, sizes, xs: XS, relativeError: 0.002, seed: 3 });

function csv(points: ScalingPoint[], energy: number | ((p: ScalingPoint) => number) = 0): string {
  const e = typeof energy === 'number' ? () => energy : energy;
  return ['L,W,E,lambda,lambda_err,note', ...points.map((p) => `${p.L},${p.x},${e(p)},${p.value},${p.error},ok`)].join('\n') + '\n';
}

const KEYS = ['model', 'Wc', 'nu', 'critical', 'chi2', 'dof', 'p', 'crossings', 'beta'];

describe('localis analyze', () => {
  describe('--json', () => {
    it('should print the analysis with 95 % intervals that hold the true W_c when the table comes from a known scaling function', async () => {
      const r = await analyze([file('lambda.csv', csv(synthetic())), '--bootstrap', '50', '--json']);
      expect(r.code, r.stderr).toBe(0);
      expect(r.stderr).toBe('');
      const result = JSON.parse(r.stdout) as Record<string, unknown> & {
        Wc: { value: number; lo: number; hi: number };
        nu: { value: number; lo: number; hi: number };
        model: { sizes: number[]; observable: string; chosenBy: string };
        intervals: { method: string; samples: number };
        crossings: unknown[];
        beta: unknown[];
      };
      for (const key of KEYS) expect(result).toHaveProperty(key);
      for (const key of ['Wc', 'nu', 'critical']) expect(Object.keys(result[key] as object).sort()).toEqual(['hi', 'lo', 'value']);
      expect(result.Wc.lo).toBeLessThanOrEqual(WC);
      expect(result.Wc.hi).toBeGreaterThanOrEqual(WC);
      expect(result.nu.lo).toBeLessThan(result.nu.hi);
      expect(Math.abs(result.nu.value - NU)).toBeLessThan(0.3);
      expect(result.model).toMatchObject({ sizes: [6, 8, 12, 16], observable: 'lambda', chosenBy: 'scan' });
      expect(result.intervals).toMatchObject({ method: 'bootstrap', samples: 50 });
      expect(result.crossings.length).toBeGreaterThan(0);
      expect(result.beta.length).toBeGreaterThan(0);
    });

    it('should fit the given orders with linearized intervals when run with --orders and --bootstrap 0, reading standard input', async () => {
      const r = await analyze(['-', '--orders', '2,0', '--bootstrap', '0', '--json'], csv(synthetic()));
      expect(r.code, r.stderr).toBe(0);
      const result = JSON.parse(r.stdout) as { model: { nr: number; ni: number; mr: number; mi: number; chosenBy: string }; intervals: { method: string } };
      expect(result.model).toMatchObject({ nr: 2, ni: 0, mr: 1, mi: 0, chosenBy: 'user' });
      expect(result.intervals.method).toBe('linearized');
    });
  });

  describe('readable output', () => {
    it('should show W_c, nu, Lambda_c, the fit quality, the scan and the screening note', async () => {
      const r = await analyze([file('lambda.csv', csv(synthetic())), '--bootstrap', '0']);
      expect(r.code, r.stderr).toBe(0);
      expect(r.stderr).toBe('');
      for (const text of ['W_c = ', 'nu = ', 'Lambda_c = ', '95 %', 'chi²/dof = ', 'p = ', 'Model: nr = ', 'Model scan', 'Crossings']) {
        expect(r.stdout).toContain(text);
      }
      expect(r.stdout).toContain('screening analysis of the given data, not a publication-grade study');
    });
  });

  describe('invalid input', () => {
    it('should exit 2 with the analysis message when the table has fewer than three sizes', async () => {
      const r = await analyze([file('two.csv', csv(synthetic([6, 8]))), '--bootstrap', '0']);
      expect(r.code).toBe(2);
      expect(r.stdout).toBe('');
      expect(r.stderr).toContain('at least three sizes');
    });

    it('should exit 2 naming the line when a cell is not a number', async () => {
      const lines = csv(synthetic()).split('\n');
      lines[4] = lines[4].replace(/^(\d+),([^,]+),/, '$1,abc,');
      const r = await analyze([file('bad.csv', lines.join('\n'))]);
      expect(r.code).toBe(2);
      expect(r.stdout).toBe('');
      expect(r.stderr).toContain('line 5');
      expect(r.stderr).toContain('"abc"');
    });

    it('should exit 2 naming the line when a cell is missing or NaN', async () => {
      const lines = csv(synthetic()).split('\n');
      lines[2] = '6,15.25,0,NaN,0.001';
      lines[3] = '6,15.5,0,0.9';
      const r = await analyze([file('bad.csv', lines.join('\n'))]);
      expect(r.code).toBe(2);
      expect(r.stderr).toContain('line 3');
      expect(r.stderr).toContain('line 4: lambda_err is missing');
    });

    it('should exit 2 listing the energies when the table holds several and --energy is missing, and analyze the one --energy picks', async () => {
      const points = [...synthetic()];
      const table = csv([...points, ...points], (p) => 0);
      // The second copy of the points at E = 1, so each energy is a whole table of its own.
      const lines = table.trimEnd().split('\n');
      const half = points.length;
      const twoEnergies = [lines[0], ...lines.slice(1, half + 1), ...lines.slice(half + 1).map((l) => l.replace(/^([^,]+,[^,]+),0,/, '$1,1,'))].join('\n');
      const path = file('energies.csv', twoEnergies);

      const r = await analyze([path, '--bootstrap', '0']);
      expect(r.code).toBe(2);
      expect(r.stdout).toBe('');
      expect(r.stderr).toContain('E = 0, 1');
      expect(r.stderr).toContain('--energy');

      const picked = await analyze([path, '--energy', '1', '--bootstrap', '0', '--json']);
      expect(picked.code, picked.stderr).toBe(0);
      expect((JSON.parse(picked.stdout) as { model: { points: number } }).model.points).toBe(half);
    });

    it('should exit 2 and name each bad option', async () => {
      const r = await analyze([file('lambda.csv', csv(synthetic())), '--observable', 'xi', '--orders', 'three', '--bootstrap', '1']);
      expect(r.code).toBe(2);
      for (const option of ['--observable', '--orders', '--bootstrap']) expect(r.stderr).toContain(option);
    });

    it('should exit 2 and suggest --observable g when the table has g columns', async () => {
      const points = synthetic();
      const table = ['L,W,g,g_err', ...points.map((p) => `${p.L},${p.x},${p.value},${p.error}`)].join('\n');
      const r = await analyze([file('g.csv', table)]);
      expect(r.code).toBe(2);
      expect(r.stderr).toContain('--observable g');
    });
  });
});
