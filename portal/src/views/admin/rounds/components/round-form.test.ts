import { RoundInput, type Round } from '@localis/shared';
import { describe, expect, it } from 'vitest';
import { emptyPool, formOf, poolErrors, poolTotal, roundChanges, roundInputOf, fromLocalInput, toLocalInput } from './round-form';

const round: Round = {
  id: '5f0c1a2b-3c4d-4e5f-8a9b-0c1d2e3f4a5b',
  name: '2027 spring round',
  opensAt: '2027-01-15T00:00:00.000Z',
  closesAt: '2027-03-31T21:59:59.000Z',
  allocationEndsAt: '2028-03-31T21:59:59.000Z',
  overdraftPercent: 0,
  status: 'upcoming',
  pools: [
    { machine: 'cluster-a', coreHours: 5_000_000 },
    { machine: 'gpu-b', coreHours: 800_000 },
  ],
  totalCoreHours: 5_800_000,
  campaignCount: 0,
  createdAt: '2026-11-01T09:00:00.000Z',
};

describe('round-form', () => {
  describe('formOf', () => {
    it('should start with one empty pool row when adding a round', () => {
      expect(formOf(null)).toEqual({ name: '', opensAt: '', closesAt: '', pools: [emptyPool()], allocationEndsAt: '', overdraftPercent: null });
    });

    it('should show the allocation end and overdraft of the round when editing', () => {
      expect(formOf({ ...round, overdraftPercent: 10 })).toMatchObject({ allocationEndsAt: round.allocationEndsAt, overdraftPercent: 10 });
    });
  });

  describe('roundInputOf', () => {
    it('should leave the allocation end and overdraft out when they are empty, so the defaults apply', () => {
      const input = roundInputOf({ ...formOf(round), allocationEndsAt: '', overdraftPercent: null });
      expect(input).not.toHaveProperty('allocationEndsAt');
      expect(input).not.toHaveProperty('overdraftPercent');
      expect(RoundInput.safeParse(input).success).toBe(true);
    });

    it('should pass them on when they are given', () => {
      const input = roundInputOf({ ...formOf(round), overdraftPercent: 20 });
      expect(input).toMatchObject({ allocationEndsAt: round.allocationEndsAt, overdraftPercent: 20 });
      expect(RoundInput.safeParse(input).success).toBe(true);
    });

    it('should let the schema refuse an overdraft above 50 % and an allocation end before the close', () => {
      const result = RoundInput.safeParse(roundInputOf({ ...formOf(round), overdraftPercent: 60, allocationEndsAt: '2027-03-01T00:00:00.000Z' }));
      expect(result.error?.issues.map((i) => i.path[0])).toEqual(expect.arrayContaining(['overdraftPercent', 'allocationEndsAt']));
    });

    it('should copy the round so edits do not touch the table when editing', () => {
      const form = formOf(round);
      form.pools[0].coreHours = 1;
      expect(round.pools[0].coreHours).toBe(5_000_000);
    });
  });

  describe('toLocalInput and fromLocalInput', () => {
    it('should give back the same instant when a time goes into the box and out again, and nothing for nothing', () => {
      expect(fromLocalInput(toLocalInput('2027-01-15T00:00:00Z'))).toBe('2027-01-15T00:00:00.000Z');
      expect(toLocalInput('2027-01-15T00:00:00Z')).toMatch(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}$/);
      expect(toLocalInput('')).toBe('');
      expect(fromLocalInput('')).toBe('');
      expect(fromLocalInput('not a time')).toBe('');
    });
  });

  describe('poolErrors', () => {
    it('should put each problem beside its row and field when the schema finds them', () => {
      const result = RoundInput.safeParse({
        name: 'Spring',
        opensAt: '2027-01-15T00:00:00Z',
        closesAt: '2027-03-31T00:00:00Z',
        pools: [{ machine: 'Cluster A', coreHours: 10 }, { machine: 'gpu-b', coreHours: null }],
      });
      expect(result.success).toBe(false);
      const errors = poolErrors(result.error!.issues);
      expect(errors.rows[0].machine).toMatch(/lower-case letters/);
      expect(errors.rows[1]).toEqual({ coreHours: 'enter the core-hours of this pool' });
      expect(errors.list).toBeUndefined();
    });

    it('should report a machine named twice for the list as a whole', () => {
      const result = RoundInput.safeParse({
        name: 'Spring',
        opensAt: '2027-01-15T00:00:00Z',
        closesAt: '2027-03-31T00:00:00Z',
        pools: [{ machine: 'gpu-b', coreHours: 10 }, { machine: 'gpu-b', coreHours: 20 }],
      });
      expect(poolErrors(result.error!.issues).list).toBe('each machine may have only one pool');
    });

    it('should place the server details too when they name a row', () => {
      expect(poolErrors([{ path: ['pools', 1, 'coreHours'], message: 'below what is already granted' }]).rows[1].coreHours).toBe('below what is already granted');
    });
  });

  describe('roundChanges', () => {
    const input = { name: round.name, opensAt: '2027-01-15T00:00:00Z', closesAt: round.closesAt, pools: round.pools.map((p) => ({ ...p })) };

    it('should find nothing to save when only the spelling of a time differs', () => {
      expect(roundChanges(input, round)).toEqual({});
    });

    it('should send a changed allocation end or overdraft, and not a missing one', () => {
      expect(roundChanges({ ...input, allocationEndsAt: '2028-03-31T21:59:59Z', overdraftPercent: 0 }, round)).toEqual({});
      expect(roundChanges({ ...input, allocationEndsAt: '2028-06-30T00:00:00.000Z', overdraftPercent: 15 }, round)).toEqual({
        allocationEndsAt: '2028-06-30T00:00:00.000Z',
        overdraftPercent: 15,
      });
    });

    it('should send only the changed fields when some change', () => {
      const pools = [{ machine: 'cluster-a', coreHours: 6_000_000 }];
      expect(roundChanges({ ...input, name: 'Spring 2027', pools }, round)).toEqual({ name: 'Spring 2027', pools });
    });
  });

  describe('poolTotal', () => {
    it('should add the typed core-hours and skip empty rows', () => {
      expect(poolTotal([{ machine: 'a1', coreHours: 100 }, emptyPool(), { machine: 'b2', coreHours: 50 }])).toBe(150);
    });
  });
});
