import type { CampaignSummary } from '@localis/shared';
import { describe, expect, it } from 'vitest';
import { availableTransitions, TRANSITIONS } from './campaign-transitions';

const none = { edit: false, submit: false, withdraw: false, startReview: false, decide: false, recordRuns: false, transfer: false, uploadResults: false, attachFiles: false, withdrawArchives: false };

describe('campaign-transitions', () => {
  describe('availableTransitions', () => {
    it('should offer nothing when the server allows nothing', () => {
      expect(availableTransitions(none)).toEqual([]);
    });

    it('should put submit first and withdraw last when a PI looks at a draft', () => {
      expect(availableTransitions({ ...none, edit: true, submit: true, withdraw: true })).toEqual(['submit', 'withdraw']);
    });

    it('should offer start review when an admin looks at a submitted proposal', () => {
      expect(availableTransitions({ ...none, startReview: true })).toEqual(['start-review']);
    });
  });

  describe('TRANSITIONS', () => {
    it('should mark only withdrawing as destructive', () => {
      expect(Object.entries(TRANSITIONS).filter(([, t]) => t.danger).map(([a]) => a)).toEqual(['withdraw']);
    });

    it('should name the round, the request and the machine when asking to submit', () => {
      const c = { title: 'Critical W in 3D', roundName: '2027 spring', requestedCoreHours: 1_250_000, machine: 'cluster-a' } as CampaignSummary;
      expect(TRANSITIONS.submit.message(c)).toContain('2027 spring, asking for 1.25 M core-hours on cluster-a');
    });
  });
});
