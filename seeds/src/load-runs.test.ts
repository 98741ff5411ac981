import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseRunImport, runMilliCoreHours } from '@localis/shared';
import { accountingCsv, runTimes } from './load-runs';
import { RUN_PLANS, type ScenarioRun } from './runs-scenario';

const NOW = new Date('2027-03-15T12:34:56Z');
const run = (over: Partial<ScenarioRun> = {}): ScenarioRun => ({
  externalJobId: '4400001', daysAgo: 10, startHourUtc: 8.5, cores: 64, shareOfGrant: 0.064, codeName: 'rgf-cond', codeVersion: '4e9c0a7',
  parameters: { sizes: [24, 32], disorder: [18.5], energies: [0], seeds: [5231, 5232] }, ...over,
});
const jobsOf = (plan: (typeof RUN_PLANS)[number]) => plan.steps.flatMap((s) => (s.kind === 'run' ? [s.run] : s.kind === 'import' ? s.runs : []));

describe('demo runs', () => {
  describe('runTimes', () => {
    it('should start the given days before the load at the given hour and last what the share of the grant takes on the cores', () => {
      // 0.064 of 1000 core-hours on 64 cores: one hour.
      expect(runTimes(run(), 1000, NOW)).toEqual({ startedAt: '2027-03-05T08:30:00Z', endedAt: '2027-03-05T09:30:00Z' });
    });

    it('should round the wall-clock to whole minutes and last at least one', () => {
      const { startedAt, endedAt } = runTimes(run({ shareOfGrant: 0.0001 }), 10, NOW);
      expect(new Date(endedAt).getTime() - new Date(startedAt).getTime()).toBe(60_000);
      const long = runTimes(run({ shareOfGrant: 0.1, cores: 256 }), 7851, NOW);
      expect((new Date(long.endedAt).getTime() - new Date(long.startedAt).getTime()) % 60_000).toBe(0);
    });
  });

  describe('accountingCsv', () => {
    it('should write a CSV whose header the import guesses and whose rows read back as the runs', () => {
      const runs = [run(), run({ externalJobId: '4400002', cores: 128, startHourUtc: 23.75 })];
      const parsed = parseRunImport({ csv: accountingCsv(runs, 1000, NOW) }, 'fjell');
      expect(parsed).toMatchObject({ fileError: null, unknownColumns: [], missingFields: [] });
      expect(parsed.rows.map((r) => r.errors)).toEqual([[], []]);
      for (const [i, r] of runs.entries()) {
        const times = runTimes(r, 1000, NOW);
        expect(parsed.rows[i].input).toMatchObject({ externalJobId: r.externalJobId, cores: r.cores, codeName: r.codeName, codeVersion: r.codeVersion, parameters: r.parameters, machine: 'fjell' });
        expect(new Date(parsed.rows[i].input!.startedAt).toISOString()).toBe(new Date(times.startedAt).toISOString());
        expect(new Date(parsed.rows[i].input!.endedAt).toISOString()).toBe(new Date(times.endedAt).toISOString());
      }
    });
  });

  describe('the scenario data', () => {
    it('should give every job its own id, 1 to 512 cores and a start within the last months', () => {
      const jobs = RUN_PLANS.flatMap(jobsOf);
      expect(new Set(jobs.map((j) => j.externalJobId)).size).toBe(jobs.length);
      for (const j of jobs) {
        expect(j.cores, j.externalJobId).toBeGreaterThanOrEqual(1);
        expect(j.cores, j.externalJobId).toBeLessThanOrEqual(512);
        expect(j.daysAgo, j.externalJobId).toBeGreaterThan(0);
        expect(j.daysAgo, j.externalJobId).toBeLessThan(150);
      }
    });

    it('should refund only a job recorded earlier in the same story', () => {
      for (const plan of RUN_PLANS) {
        plan.steps.forEach((s, i) => {
          if (s.kind !== 'refund') return;
          const before = jobsOf({ ...plan, steps: plan.steps.slice(0, i) });
          expect(before.map((j) => j.externalJobId)).toContain(s.externalJobId);
        });
      }
    });

    it('should keep the Quantum Transport story between the 75 % and 90 % alerts for a small or a large grant', () => {
      const plan = RUN_PLANS.find((p) => p.campaignId === '5e000000-0000-4000-8000-000000000005')!;
      for (const grant of [2_000, 7_851, 50_000]) {
        let used = 0;
        let peak = 0;
        const charged = new Map<string, number>();
        for (const s of plan.steps) {
          for (const j of s.kind === 'run' ? [s.run] : s.kind === 'import' ? s.runs : []) {
            const { startedAt, endedAt } = runTimes(j, grant, NOW);
            charged.set(j.externalJobId, runMilliCoreHours(j.cores, startedAt, endedAt));
            used += charged.get(j.externalJobId)!;
          }
          if (s.kind === 'refund') used -= charged.get(s.externalJobId)!;
          peak = Math.max(peak, used);
        }
        expect(used / (grant * 1000), `grant ${grant}`).toBeGreaterThanOrEqual(0.75);
        expect(peak / (grant * 1000), `grant ${grant}`).toBeLessThan(0.9);
      }
    });

    it('should leave the scheduler export for trying the import out of the recorded jobs', () => {
      const csv = readFileSync(new URL('../data/scheduler-export.csv', import.meta.url), 'utf8');
      const exportIds = csv.trim().split('\n').slice(1).map((line) => line.split(',')[0]);
      const recorded = new Set(RUN_PLANS.flatMap(jobsOf).map((j) => j.externalJobId));
      expect(exportIds.filter((id) => recorded.has(id))).toEqual([]);
    });
  });
});
