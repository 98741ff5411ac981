import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { runCli, tempConfigDir, type CliResult } from '../../test/cli-harness';

// Offline: no api, no sign-in. Every run points LOCALIS_URL at a port where nothing listens, so a
// stray call to the portal would fail the test rather than pass by luck.
const OFFLINE = { LOCALIS_URL: 'http://127.0.0.1:4' };

let config: ReturnType<typeof tempConfigDir>;
beforeEach(() => {
  config = tempConfigDir();
});
afterEach(() => config.remove());

const tmm = (args: string[], onSpawn?: Parameters<typeof runCli>[1]['onSpawn']) => runCli(['tmm', ...args], { configDir: config.dir, env: OFFLINE, onSpawn });

const KEYS = ['dim', 'width', 'disorder', 'energy', 'slices', 'gammaMin', 'gammaErr', 'xi', 'xiErr', 'lambda', 'lambdaErr', 'seconds'];
type Result = Record<(typeof KEYS)[number], number>;

/** A quick 2D run: 4 channels, a few thousand slices. */
const QUICK_2D = ['--dim', '2', '--width', '4', '--disorder', '5', '--slices', '20000'];

/** Long enough never to finish inside a test: cancelled by the test itself. */
const ENDLESS = ['--dim', '3', '--width', '10', '--disorder', '16.5', '--slices', '100000000', '--allow-long'];

/**
 * Presses Ctrl-C `afterMs` after the start. A signal that lands before the CLI has installed its
 * handler (a slow start on a busy machine) ends the process the default way, without an exit
 * code; that attempt says nothing about `tmm` and is tried again with a longer wait.
 */
async function interrupted(args: string[]): Promise<CliResult & { stoppedInMs: number }> {
  for (const afterMs of [1500, 3000, 6000]) {
    let signalledAt = 0;
    const r = await tmm(args, (child) => {
      setTimeout(() => {
        signalledAt = performance.now();
        child.kill('SIGINT');
      }, afterMs);
    });
    if (r.code !== null) return { ...r, stoppedInMs: performance.now() - signalledAt };
  }
  throw new Error('the CLI never got as far as handling Ctrl-C');
}

describe('localis tmm', () => {
  describe('--json', () => {
    it('should print one JSON object with the result fields and xi = 24(4 - E²)/W² when a 1D chain has weak disorder', async () => {
      // Thouless, J. Phys. C 5, 77 (1972): the weak-disorder limit, 288 at W = 0.5, E = 1. Its
      // O(W²) correction is about 0.3 % here, well inside the statistical error; at W = 2 it is
      // about -4.6 % (xi near 17.2, not 18), which 200,000 slices already resolve.
      const r = await tmm(['--dim', '1', '--disorder', '0.5', '--energy', '1', '--slices', '1000000', '--json']);
      expect(r.code, r.stderr).toBe(0);
      expect(r.stderr).toBe('');
      const result = JSON.parse(r.stdout) as Result;
      expect(Object.keys(result).sort()).toEqual([...KEYS].sort());
      expect(result).toMatchObject({ dim: 1, width: 1, disorder: 0.5, energy: 1, slices: 1_000_000 });
      const expected = (24 * (4 - 1)) / 0.5 ** 2;
      expect(Math.abs(result.xi - expected), `${result.xi} ± ${result.xiErr} vs ${expected}`).toBeLessThan(3 * result.xiErr);
      expect(result.xiErr / result.xi).toBeLessThan(0.03);
      expect(result.gammaMin * result.xi).toBeCloseTo(1, 12);
      // Lambda = xi / L, and L = 1.
      expect(result.lambda).toBe(result.xi);
      expect(result.lambdaErr).toBe(result.xiErr);
      expect(result.seconds).toBeGreaterThan(0);
    });

    it('should give identical results apart from the time when the seed is the same, and others when it is not', async () => {
      const [a, b, c] = await Promise.all([
        tmm([...QUICK_2D, '--seed', '7', '--json']),
        tmm([...QUICK_2D, '--seed', '7', '--json']),
        tmm([...QUICK_2D, '--seed', '8', '--json']),
      ]);
      for (const r of [a, b, c]) expect(r.code, r.stderr).toBe(0);
      const strip = (stdout: string) => {
        const { seconds: _, ...rest } = JSON.parse(stdout) as Result;
        return rest;
      };
      expect(strip(b.stdout)).toEqual(strip(a.stdout));
      expect(strip(c.stdout).gammaMin).not.toBe(strip(a.stdout).gammaMin);
    });

    it('should stop at the asked precision when --precision is given', async () => {
      const r = await tmm(['--dim', '2', '--width', '4', '--disorder', '8', '--precision', '0.05', '--json']);
      expect(r.code, r.stderr).toBe(0);
      const result = JSON.parse(r.stdout) as Result;
      expect(result.gammaErr / result.gammaMin).toBeLessThanOrEqual(0.05);
      expect(result.lambda).toBeCloseTo(result.xi / 4, 12);
    });
  });

  describe('human output', () => {
    it('should show Lambda, xi and gamma_min with their errors, the slices and the time, and no progress when stderr is not a terminal', async () => {
      const r = await tmm(QUICK_2D);
      expect(r.code, r.stderr).toBe(0);
      expect(r.stderr).toBe('');
      expect(r.stdout).toContain('Transfer matrix, d = 2, L = 4, W = 5, E = 0 (seed 1, QR every 5 slices)');
      expect(r.stdout).toMatch(/^Lambda = xi\/L = \d+\.\d+ ± \d+\.\d+ \([\d.]+ %\)$/m);
      expect(r.stdout).toMatch(/^xi = \d+\.\d+ ± \d+\.\d+$/m);
      expect(r.stdout).toMatch(/^gamma_min = \d+\.\d+ ± \d+\.\d+$/m);
      expect(r.stdout).toContain('Slices: 20,000, stopped by the slice count');
      expect(r.stdout).toMatch(/^Time: \d+\.\d+ s$/m);
    });
  });

  describe('invalid options', () => {
    it.each([
      ['a dimension of 4', ['--dim', '4', '--width', '4', '--disorder', '5'], '--dim: the dimension d must be 1, 2 or 3 (read "4")'],
      ['no dimension', ['--width', '4', '--disorder', '5'], '--dim: give the dimension d'],
      ['a width of 0', ['--dim', '2', '--width', '0', '--disorder', '5'], '--width: the width L must be a positive integer (read "0")'],
      ['a width of 2.5', ['--dim', '3', '--width', '2.5', '--disorder', '5'], '--width: the width L must be a positive integer (read "2.5")'],
      ['no width in 2D', ['--dim', '2', '--disorder', '5'], '--width: give the width L'],
      ['a width other than 1 in 1D', ['--dim', '1', '--width', '8', '--disorder', '5'], '--width: a 1D chain has width 1'],
      ['negative disorder', ['--dim', '2', '--width', '4', '--disorder', '-1'], '--disorder: the disorder W must be a number, 0 or more (read "-1")'],
      ['no disorder', ['--dim', '2', '--width', '4'], '--disorder: give the disorder W'],
      ['no disorder and only a precision', ['--dim', '2', '--width', '4', '--disorder', '0'], '--disorder: with W = 0 nothing localizes the states'],
      ['an energy that is not a number', ['--dim', '2', '--width', '4', '--disorder', '5', '--energy', 'x'], '--energy: the energy E must be a number (read "x")'],
      ['a precision of 0', ['--dim', '2', '--width', '4', '--disorder', '5', '--precision', '0'], '--precision: the precision must be between 0 and 1'],
      ['a precision of 1.5', ['--dim', '2', '--width', '4', '--disorder', '5', '--precision', '1.5'], '--precision: the precision must be between 0 and 1'],
      ['a slice count of 0', ['--dim', '2', '--width', '4', '--disorder', '5', '--slices', '0'], '--slices: the slice count must be a positive integer (read "0")'],
      ['a slice count of 10.5', ['--dim', '2', '--width', '4', '--disorder', '5', '--slices', '10.5'], '--slices: the slice count must be a positive integer (read "10.5")'],
      ['a negative seed', ['--dim', '2', '--width', '4', '--disorder', '5', '--seed', '-3'], '--seed: the seed must be an integer from 0 to 4294967295'],
      ['re-orthonormalizing every 0 slices', ['--dim', '2', '--width', '4', '--disorder', '5', '--reorthogonalize-every', '0'], '--reorthogonalize-every: '],
    ])('should exit 2 and name the option when given %s', async (_, args, line) => {
      const r = await tmm(args);
      expect(r.code).toBe(2);
      expect(r.stdout).toBe('');
      expect(r.stderr).toContain('the options of `localis tmm` are not valid:');
      expect(r.stderr).toContain(`\n  ${line}`);
    });

    it('should list every problem, each on its own line, when there are several', async () => {
      const r = await tmm(['--dim', '4', '--width', '0', '--disorder', '-1', '--slices', '0']);
      expect(r.code).toBe(2);
      for (const option of ['--dim', '--width', '--disorder', '--slices']) expect(r.stderr).toMatch(new RegExp(`^  ${option}: `, 'm'));
    });

    it('should exit 2 when an option is unknown', async () => {
      const r = await tmm(['--dim', '2', '--width', '4', '--disorder', '5', '--realizations', '3']);
      expect(r.code).toBe(2);
      expect(r.stderr).toContain("unknown option '--realizations'");
    });
  });

  describe('long runs', () => {
    it('should refuse with the estimated time and the flag when the run would take hours and --allow-long is not given', async () => {
      const r = await tmm(['--dim', '3', '--width', '40', '--disorder', '16.5', '--precision', '0.001']);
      expect(r.code).toBe(2);
      expect(r.stdout).toBe('');
      // 40 / 0.001² = 4e7 slices of about 2.8e9 operations each, at 5e8 operations/s: about 7 years.
      expect(r.stderr).toMatch(/^localis: this run would take about [\d.]+ years on one core: 4\.0e7 slices .* × 2\.8e9 operations at 5\.0e8 operations\/s\.$/m);
      expect(r.stderr).toContain('Check the width and the precision, or add --allow-long to run it anyway');
    });

    it('should count the given slices when --slices makes the run long', async () => {
      const r = await tmm(['--dim', '3', '--width', '40', '--disorder', '16.5', '--slices', '10000', '--json']);
      expect(r.code).toBe(2);
      expect(r.stdout).toBe('');
      expect(r.stderr).toContain('this run would take about 15.3 hours on one core: 1.0e4 slices × 2.8e9 operations');
    });
  });

  describe('Ctrl-C', () => {
    it('should stop the run, say after how many slices and exit 130 when interrupted', async () => {
      const r = await interrupted([...ENDLESS, '--json']);
      expect(r.code, r.stderr).toBe(130);
      expect(r.stdout).toBe('');
      expect(r.stderr).toMatch(/^localis: cancelled after [\d,]+ slices; no result\.$/m);
      expect(r.stoppedInMs).toBeLessThan(5000);
    });

    it('should stop within about a second when one re-orthonormalization takes longer than that', async () => {
      // 900 channels: one QR is some 3e9 operations, seconds of work between two looks at the flag.
      const r = await interrupted(['--dim', '3', '--width', '30', '--disorder', '16.5', '--slices', '1000000', '--allow-long']);
      expect(r.code, r.stderr).toBe(130);
      expect(r.stderr).toMatch(/^localis: cancelled.*; no result\.$/m);
      expect(r.stoppedInMs).toBeLessThan(5000);
    });
  });
});
