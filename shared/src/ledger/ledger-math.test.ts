import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  balancesOf,
  formatCoreHours,
  fromMilli,
  judgeDebit,
  LEDGER_SIGNS,
  overdraftAllowance,
  runMilliCoreHours,
  thresholdsReached,
  toMilli,
  type Balances,
  type LedgerAmount,
} from './ledger-math';

/** What may happen to a campaign's grant, before the rules decide whether it is allowed. */
type Operation =
  | { op: 'grant'; milli: number }
  | { op: 'debit'; milli: number }
  /** Refund part of one earlier run: `run` and `milli` are reduced to a run that exists and what is left of its debit. */
  | { op: 'refund'; run: number; milli: number }
  | { op: 'adjustment'; milli: number }
  | { op: 'transfer-in'; milli: number }
  | { op: 'transfer-out'; milli: number }
  | { op: 'expiry' };

const amount = fc.integer({ min: 1, max: 5_000_000 });
const operation: fc.Arbitrary<Operation> = fc.oneof(
  { arbitrary: fc.record({ op: fc.constant('grant' as const), milli: fc.integer({ min: 1, max: 20_000_000 }) }), weight: 2 },
  { arbitrary: fc.record({ op: fc.constant('debit' as const), milli: amount }), weight: 6 },
  { arbitrary: fc.record({ op: fc.constant('refund' as const), run: fc.nat(), milli: amount }), weight: 2 },
  { arbitrary: fc.record({ op: fc.constant('adjustment' as const), milli: fc.integer({ min: -5_000_000, max: 5_000_000 }).filter((m) => m !== 0) }), weight: 1 },
  { arbitrary: fc.record({ op: fc.constant('transfer-in' as const), milli: amount }), weight: 1 },
  { arbitrary: fc.record({ op: fc.constant('transfer-out' as const), milli: amount }), weight: 1 },
  { arbitrary: fc.constant({ op: 'expiry' as const }), weight: 1 },
);
/** Most sequences start with a grant, as a real campaign's ledger does; some do not, to try debits on nothing. */
const history = fc.tuple(fc.boolean(), fc.integer({ min: 1, max: 20_000_000 }), fc.array(operation, { maxLength: 60 }));
const overdraftPercent = fc.integer({ min: 1, max: 50 });

/**
 * A campaign's ledger replayed under the rules the api applies: debits only when `judgeDebit`
 * allows them, refunds at most what a run was charged, and adjustments, transfers out and expiry
 * never taking more than remains. Kept alongside: a running total by category, worked out
 * independently of `balancesOf`, to compare with it after every step.
 */
function replay(operations: Operation[], percent: number) {
  const entries: LedgerAmount[] = [];
  const runs: { debited: number; refunded: number }[] = [];
  const expected = { granted: 0, used: 0, expired: 0 };
  const steps: { balances: Balances; expected: typeof expected; entries: LedgerAmount[] }[] = [];
  let refused = 0;
  const write = (entry: LedgerAmount) => {
    entries.push(entry);
    steps.push({ balances: balancesOf(entries), expected: { ...expected }, entries: [...entries] });
  };
  for (const o of operations) {
    const before = balancesOf(entries);
    switch (o.op) {
      case 'grant':
      case 'transfer-in':
        expected.granted += o.milli;
        write({ kind: o.op === 'grant' ? 'grant' : 'transfer', milli: o.milli });
        break;
      case 'debit': {
        const verdict = judgeDebit(before, o.milli, percent);
        if (!verdict.allowed) {
          refused++;
          break;
        }
        runs.push({ debited: o.milli, refunded: 0 });
        expected.used += o.milli;
        write({ kind: 'debit', milli: -o.milli });
        break;
      }
      case 'refund': {
        const refundable = runs.filter((r) => r.refunded < r.debited);
        if (!refundable.length) break;
        const run = refundable[o.run % refundable.length];
        const milli = 1 + ((o.milli - 1) % (run.debited - run.refunded));
        run.refunded += milli;
        expected.used -= milli;
        write({ kind: 'refund', milli });
        break;
      }
      case 'adjustment':
        if (o.milli < 0 && -o.milli > before.remaining) break;
        expected.granted += o.milli;
        write({ kind: 'adjustment', milli: o.milli });
        break;
      case 'transfer-out':
        if (o.milli > before.remaining) break;
        expected.granted -= o.milli;
        write({ kind: 'transfer', milli: -o.milli });
        break;
      case 'expiry':
        if (before.remaining <= 0) break;
        expected.expired += before.remaining;
        write({ kind: 'expiry', milli: -before.remaining });
        break;
    }
  }
  return { entries, steps, refused, runs };
}

const withGrant = ([startsGranted, grant, operations]: [boolean, number, Operation[]]): Operation[] =>
  startsGranted ? [{ op: 'grant', milli: grant }, ...operations] : operations;

const sum = (entries: readonly LedgerAmount[]) => entries.reduce((total, e) => total + e.milli, 0);

describe('ledger-math', () => {
  describe('balances of any allowed history', () => {
    it('should keep remaining equal to the sum of the entries after every step when the policy refuses overdrafts', () => {
      fc.assert(
        fc.property(history, (h) => {
          for (const step of replay(withGrant(h), 0).steps) expect(step.balances.remaining).toBe(sum(step.entries));
        }),
      );
    });

    it('should keep remaining equal to the sum of the entries after every step when an overdraft is allowed', () => {
      fc.assert(
        fc.property(history, overdraftPercent, (h, percent) => {
          for (const step of replay(withGrant(h), percent).steps) expect(step.balances.remaining).toBe(sum(step.entries));
        }),
      );
    });

    it('should never go below zero when the overdraft policy is 0 %', () => {
      fc.assert(
        fc.property(history, (h) => {
          for (const { balances } of replay(withGrant(h), 0).steps) expect(balances.remaining).toBeGreaterThanOrEqual(0);
        }),
      );
    });

    it('should never go below minus the overdraft allowance when the policy is p %', () => {
      fc.assert(
        fc.property(history, overdraftPercent, (h, percent) => {
          for (const { balances } of replay(withGrant(h), percent).steps) {
            expect(balances.remaining).toBeGreaterThanOrEqual(-overdraftAllowance(balances.granted, percent));
          }
        }),
      );
    });

    it('should give granted - used - expired = remaining, with each part matching a running total kept by category', () => {
      fc.assert(
        fc.property(history, fc.constantFrom(0, 10, 25), (h, percent) => {
          for (const { balances, expected } of replay(withGrant(h), percent).steps) {
            expect(balances.granted - balances.used - balances.expired).toBe(balances.remaining);
            expect({ granted: balances.granted, used: balances.used, expired: balances.expired }).toEqual(expected);
          }
        }),
      );
    });

    it('should never make used negative when refunds are at most what each run was charged', () => {
      fc.assert(
        fc.property(history, (h) => {
          const { steps, runs } = replay(withGrant(h), 0);
          for (const { balances } of steps) expect(balances.used).toBeGreaterThanOrEqual(0);
          for (const run of runs) expect(run.refunded).toBeLessThanOrEqual(run.debited);
        }),
      );
    });

    it('should write only the sign each kind may carry', () => {
      fc.assert(
        fc.property(history, overdraftPercent, (h, percent) => {
          for (const e of replay(withGrant(h), percent).entries) {
            const sign = LEDGER_SIGNS[e.kind];
            if (sign === 'positive') expect(e.milli).toBeGreaterThan(0);
            if (sign === 'negative') expect(e.milli).toBeLessThan(0);
          }
        }),
      );
    });

    it('should leave nothing to spend after the remainder expires', () => {
      fc.assert(
        fc.property(history, (h) => {
          const { entries } = replay([...withGrant(h), { op: 'expiry' }], 0);
          expect(balancesOf(entries).remaining).toBe(0);
          expect(judgeDebit(balancesOf(entries), 1, 0).allowed).toBe(false);
        }),
      );
    });

    it('should refuse a debit on a campaign that was never granted anything', () => {
      fc.assert(
        fc.property(amount, fc.constantFrom(0, 10, 50), (debit, percent) => {
          expect(judgeDebit(balancesOf([]), debit, percent)).toEqual({ allowed: false, shortBy: debit, remainingAfter: -debit });
        }),
      );
    });
  });

  describe('judgeDebit against its rule', () => {
    const state = fc.record({ granted: fc.integer({ min: 0, max: 10_000_000 }), used: fc.integer({ min: 0, max: 12_000_000 }) });

    it('should allow a debit exactly when it ends at or above minus the allowance, and flag it when it goes below zero', () => {
      fc.assert(
        fc.property(state, amount, fc.constantFrom(0, 5, 10, 20, 100), ({ granted, used }, debit, percent) => {
          const balances = balancesOf([
            { kind: 'grant', milli: granted },
            { kind: 'debit', milli: -used },
          ]);
          const floor = -Math.floor((granted * percent) / 100);
          const verdict = judgeDebit(balances, debit, percent);
          expect(verdict.remainingAfter).toBe(granted - used - debit);
          expect(verdict.allowed).toBe(granted - used - debit >= floor);
          if (verdict.allowed) expect(verdict.overdraft).toBe(granted - used - debit < 0);
          else expect(verdict.shortBy).toBe(floor - (granted - used - debit));
        }),
      );
    });
  });

  describe('judgeDebit edge cases', () => {
    const granted = balancesOf([{ kind: 'grant', milli: 10_000 }]);

    it('should allow a debit of exactly what remains, without an overdraft, when the policy is 0 %', () => {
      expect(judgeDebit(granted, 10_000, 0)).toEqual({ allowed: true, overdraft: false, remainingAfter: 0 });
    });

    it('should refuse one milli-core-hour more than remains, short by 1, when the policy is 0 %', () => {
      expect(judgeDebit(granted, 10_001, 0)).toEqual({ allowed: false, shortBy: 1, remainingAfter: -1 });
    });

    it('should allow and flag a debit that goes below zero within a 10 % allowance', () => {
      expect(overdraftAllowance(10_000, 10)).toBe(1_000);
      expect(judgeDebit(granted, 10_500, 10)).toEqual({ allowed: true, overdraft: true, remainingAfter: -500 });
      expect(judgeDebit(granted, 11_000, 10)).toEqual({ allowed: true, overdraft: true, remainingAfter: -1_000 });
    });

    it('should refuse one milli-core-hour past the 10 % allowance', () => {
      expect(judgeDebit(granted, 11_001, 10)).toEqual({ allowed: false, shortBy: 1, remainingAfter: -1_001 });
    });

    it('should measure the allowance on a grant that is never negative and round it down', () => {
      expect(overdraftAllowance(-5_000, 10)).toBe(0);
      expect(overdraftAllowance(999, 10)).toBe(99);
    });
  });

  describe('thresholdsReached', () => {
    // A grant of 1 536 core-hours: 75 % is 1 152, 90 % is 1 382.4, 100 % is 1 536.
    const at = (usedMilli: number) => thresholdsReached(balancesOf([{ kind: 'grant', milli: 1_536_000 }, { kind: 'debit', milli: -usedMilli }]));

    it('should report nothing just below 75 %', () => {
      expect(at(1_151_999)).toEqual([]);
    });

    it('should report 75 at exactly 75 %', () => {
      expect(at(1_152_000)).toEqual([75]);
    });

    it('should report 75 and 90 at exactly 90 % and not just below it', () => {
      expect(at(1_382_399)).toEqual([75]);
      expect(at(1_382_400)).toEqual([75, 90]);
    });

    it('should report all three at exactly 100 % and above, in an overdraft', () => {
      expect(at(1_535_999)).toEqual([75, 90]);
      expect(at(1_536_000)).toEqual([75, 90, 100]);
      expect(at(1_700_000)).toEqual([75, 90, 100]);
    });

    it('should report nothing when nothing is granted', () => {
      expect(thresholdsReached(balancesOf([]))).toEqual([]);
      expect(thresholdsReached({ granted: 0, used: 5, expired: 0, remaining: -5 })).toEqual([]);
    });

    it('should count refunds back, so a refunded run can drop below a threshold again', () => {
      const balances = balancesOf([
        { kind: 'grant', milli: 1_000 },
        { kind: 'debit', milli: -800 },
        { kind: 'refund', milli: 100 },
      ]);
      expect(thresholdsReached(balances)).toEqual([]);
    });
  });

  describe('toMilli and fromMilli', () => {
    it('should round-trip every value with at most three decimals when read from its decimal text', () => {
      fc.assert(
        fc.property(fc.integer({ min: -1_000_000_000_000_000, max: 1_000_000_000_000_000 }), (milli) => {
          const sign = milli < 0 ? '-' : '';
          const whole = Math.floor(Math.abs(milli) / 1000);
          const text = `${sign}${whole}.${String(Math.abs(milli) % 1000).padStart(3, '0')}`;
          expect(toMilli(Number(text))).toBe(milli);
          expect(toMilli(fromMilli(milli))).toBe(milli);
          expect(fromMilli(milli)).toBe(Number(text));
        }),
      );
    });

    it('should round half away from zero at the fourth decimal', () => {
      expect(toMilli(1.0005)).toBe(1_001);
      expect(toMilli(-1.0005)).toBe(-1_001);
      expect(toMilli(1.0004)).toBe(1_000);
      expect(toMilli(0.0005)).toBe(1);
    });

    it('should give a plain 0, not -0, for a tiny negative amount', () => {
      expect(Object.is(toMilli(-0.0004), 0)).toBe(true);
      expect(formatCoreHours(toMilli(-0.0004))).toBe('0');
    });
  });

  describe('runMilliCoreHours', () => {
    it('should charge 1 536 000 milli for the worked example: 128 cores for 12 h = 1 536 core-hours', () => {
      expect(runMilliCoreHours(128, '2027-02-01T08:00:00Z', '2027-02-01T20:00:00Z')).toBe(1_536_000);
      expect(formatCoreHours(1_536_000)).toBe('1,536');
    });

    it('should charge 1 000 milli for the worked example: 3 cores for 20 min = 1 core-hour', () => {
      expect(runMilliCoreHours(3, '2027-02-01T08:00:00Z', '2027-02-01T08:20:00Z')).toBe(1_000);
    });

    it('should read offsets, so the same instant in two zones charges the same', () => {
      expect(runMilliCoreHours(64, '2027-02-01T09:00:00+01:00', '2027-02-01T10:30:00Z')).toBe(160_000);
    });

    it('should round to the nearest milli-core-hour when the run is not a whole number of them', () => {
      // 1 core for 10 s = 0.002777… core-hours.
      expect(runMilliCoreHours(1, '2027-02-01T08:00:00Z', '2027-02-01T08:00:10Z')).toBe(3);
    });

    it('should round an exact half up when the run is long, e.g. 181 cores for 664 011 s = 33 384.9975 core-hours', () => {
      expect(runMilliCoreHours(181, new Date(0), new Date(664_011_000))).toBe(33_384_998);
    });

    it('should equal cores x seconds / 3.6 rounded half up, worked out in whole numbers, for any run', () => {
      // Every other case is an exact half (cores x seconds = 9 mod 18), where rounding is easiest to get wrong.
      const halves = fc.tuple(fc.integer({ min: 0, max: 5_000 }), fc.integer({ min: 0, max: 100_000 })).map(([a, b]): [number, number] => [9 * (2 * a + 1), 2 * b + 1]);
      const run = fc.oneof(fc.tuple(fc.integer({ min: 1, max: 100_000 }), fc.integer({ min: 1, max: 30 * 86_400 })), halves);
      fc.assert(
        fc.property(run, ([cores, seconds]) => {
          const start = new Date('2027-02-01T00:00:00Z');
          const end = new Date(start.getTime() + seconds * 1000);
          // cores x seconds / 3.6 = 5 cores x seconds / 18; half up is floor((2n + 18) / 36) for n = 5 cores x seconds.
          const n = 5 * cores * seconds;
          expect(runMilliCoreHours(cores, start, end)).toBe(Math.floor((2 * n + 18) / 36));
        }),
      );
    });
  });
});
