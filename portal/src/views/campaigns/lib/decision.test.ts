import { DecisionInput } from '@localis/shared';
import { describe, expect, it } from 'vitest';
import { decisionInputOf, decisionSentence, grantOf, grantProblems, grantShareText, poolImpact } from './decision';

const POOL = { pool: 5_000_000, granted: 3_000_000, unallocated: 2_000_000 };
const context = { requested: 1_250_000, unallocated: 2_000_000, machine: 'cluster-a' };

describe('decision', () => {
  describe('grantOf', () => {
    it('should grant the request when granting all', () => {
      expect(grantOf({ outcome: 'grant-all', coreHours: 5 }, 1_250_000)).toBe(1_250_000);
    });

    it('should grant the core-hours typed when granting part', () => {
      expect(grantOf({ outcome: 'grant-part', coreHours: 800_000 }, 1_250_000)).toBe(800_000);
    });

    it('should grant nothing when declining and not know yet when nothing is chosen', () => {
      expect(grantOf({ outcome: 'decline', coreHours: 800_000 }, 1_250_000)).toBe(0);
      expect(grantOf({ outcome: null, coreHours: null }, 1_250_000)).toBeNull();
    });
  });

  describe('grantShareText', () => {
    it('should keep two significant digits when the grant is a tiny share of a huge pool', () => {
      expect(grantShareText(3_000, 10_000_000)).toBe('0.03 % of the pool');
      expect(grantShareText(1, 10_000_000)).toBe('0.00001 % of the pool');
    });

    it('should round to whole percent when the share is ten percent or more', () => {
      expect(grantShareText(1_250_000, 5_000_000)).toBe('25 % of the pool');
      expect(grantShareText(6_000_000, 5_000_000)).toBe('120 % of the pool');
    });

    it('should say nothing is taken when there is no grant and that there is no pool when it is empty', () => {
      expect(grantShareText(0, 5_000_000)).toBe('0 % of the pool');
      expect(grantShareText(100, 0)).toBe('no pool to share');
    });
  });

  describe('poolImpact', () => {
    it('should take the grant off what is unallocated when it fits', () => {
      expect(poolImpact(POOL, 1_250_000)).toEqual({
        pool: 5_000_000,
        grantedBefore: 3_000_000,
        unallocatedBefore: 2_000_000,
        grant: 1_250_000,
        grantedAfter: 4_250_000,
        unallocatedAfter: 750_000,
        fits: true,
      });
    });

    it('should fit exactly when the grant takes all that is left', () => {
      expect(poolImpact(POOL, 2_000_000)).toMatchObject({ unallocatedAfter: 0, fits: true });
    });

    it('should say it does not fit and go below zero when the grant is larger than what is left', () => {
      expect(poolImpact(POOL, 2_500_000)).toMatchObject({ unallocatedAfter: -500_000, fits: false });
    });

    it('should leave the pool as it is when no grant is chosen yet', () => {
      expect(poolImpact(POOL, null)).toMatchObject({ grant: 0, unallocatedAfter: 2_000_000, fits: true });
    });
  });

  describe('grantProblems', () => {
    it('should find nothing when the grant fits and a part is less than the request', () => {
      expect(grantProblems({ outcome: 'grant-all', coreHours: null }, context)).toEqual({});
      expect(grantProblems({ outcome: 'grant-part', coreHours: 600_000 }, context)).toEqual({});
      expect(grantProblems({ outcome: 'decline', coreHours: null }, context)).toEqual({});
    });

    it('should refuse granting all beside the outcome when the request is more than the pool has left', () => {
      expect(grantProblems({ outcome: 'grant-all', coreHours: null }, { ...context, unallocated: 1_000_000 })).toEqual({
        outcome: 'the request of 1,250,000 core-hours is more than the 1,000,000 core-hours left unallocated in the cluster-a pool: grant part of it or decline',
      });
    });

    it('should refuse a part beside the core-hours when it is more than the pool has left', () => {
      expect(grantProblems({ outcome: 'grant-part', coreHours: 900_000 }, { ...context, unallocated: 500_000 })).toEqual({
        coreHours: 'that is more than the 500,000 core-hours left unallocated in the cluster-a pool',
      });
    });

    it('should point to Grant all when the part is the whole request or more', () => {
      expect(grantProblems({ outcome: 'grant-part', coreHours: 1_250_000 }, context).coreHours).toMatch(/^a partial grant is less than the 1,250,000 core-hours requested/);
    });

    it('should leave the pool check to the api when the pool could not be read', () => {
      expect(grantProblems({ outcome: 'grant-all', coreHours: null }, { ...context, unallocated: null })).toEqual({});
    });
  });

  describe('decisionInputOf', () => {
    it('should send the core-hours of a partial grant', () => {
      const input = decisionInputOf({ outcome: 'grant-part', coreHours: 600_000, message: 'Granted in part: the largest size is not needed.' });
      expect(DecisionInput.parse(input)).toEqual({ outcome: 'grant-part', coreHours: 600_000, message: 'Granted in part: the largest size is not needed.' });
    });

    it('should leave core-hours typed earlier out when the outcome changed to grant all', () => {
      const input = decisionInputOf({ outcome: 'grant-all', coreHours: 600_000, message: 'Granted as requested.' });
      expect(DecisionInput.parse(input)).toEqual({ outcome: 'grant-all', message: 'Granted as requested.' });
    });

    it('should make the schema ask for core-hours when a partial grant has none', () => {
      const result = DecisionInput.safeParse(decisionInputOf({ outcome: 'grant-part', coreHours: null, message: 'Granted in part, see the reviews.' }));
      expect(result.success).toBe(false);
      expect(result.error?.issues[0]).toMatchObject({ path: ['coreHours'], message: 'give the core-hours of a partial grant' });
    });
  });

  describe('decisionSentence', () => {
    it('should say what is granted of the request, or that it is declined', () => {
      expect(decisionSentence('grant-all', 1_250_000, 1_250_000, 'Critical W')).toBe('Grant “Critical W” the 1,250,000 core-hours it requests.');
      expect(decisionSentence('grant-part', 600_000, 1_250_000, 'Critical W')).toBe('Grant “Critical W” 600,000 of the 1,250,000 core-hours it requests.');
      expect(decisionSentence('decline', 0, 1_250_000, 'Critical W')).toBe('Decline “Critical W”.');
    });
  });
});
