import { describe, expect, it } from 'vitest';
import { CAMPAIGN_STATES, CAMPAIGN_TRANSITIONS, CampaignInput, CampaignListQuery, CampaignPatch, canTransition, type CampaignState, type CampaignTransition } from './campaign.schema';
import { EXAMPLE_CAMPAIGN_SPEC } from './example-spec';

const GROUP = '0b6f1a52-7c1e-4d55-9a57-4f1c2a0e5b11';
const ROUND = '5d3e2c41-1a2b-4c3d-8e9f-0a1b2c3d4e5f';

describe('campaign schemas', () => {
  describe('canTransition', () => {
    // Rows: the state a campaign is in; columns: submit, withdraw, start-review, decide.
    const TABLE: Record<CampaignState, Record<CampaignTransition, boolean>> = {
      draft: { submit: true, withdraw: true, 'start-review': false, decide: false },
      submitted: { submit: false, withdraw: true, 'start-review': true, decide: true },
      'in-review': { submit: false, withdraw: true, 'start-review': false, decide: true },
      granted: { submit: false, withdraw: false, 'start-review': false, decide: false },
      'partly-granted': { submit: false, withdraw: false, 'start-review': false, decide: false },
      declined: { submit: false, withdraw: false, 'start-review': false, decide: false },
      withdrawn: { submit: false, withdraw: false, 'start-review': false, decide: false },
    };

    it.each(CAMPAIGN_STATES)('should allow exactly the moves of the table when the campaign is %s', (state) => {
      for (const transition of Object.keys(CAMPAIGN_TRANSITIONS) as CampaignTransition[]) {
        expect(canTransition(state, transition), `${state} → ${transition}`).toBe(TABLE[state][transition]);
      }
    });

    it('should lead to submitted, withdrawn and in-review, and leave the decision to the grant', () => {
      expect(CAMPAIGN_TRANSITIONS.submit.to).toBe('submitted');
      expect(CAMPAIGN_TRANSITIONS.withdraw.to).toBe('withdrawn');
      expect(CAMPAIGN_TRANSITIONS['start-review'].to).toBe('in-review');
      expect(CAMPAIGN_TRANSITIONS.decide.to).toBeNull();
    });
  });

  describe('CampaignListQuery', () => {
    it('should turn the query-string dimension into a number when it is 1, 2 or 3', () => {
      expect(CampaignListQuery.parse({ dimension: '3' }).dimension).toBe(3);
    });

    it('should refuse another dimension with a message when it is not 1, 2 or 3', () => {
      expect(CampaignListQuery.safeParse({ dimension: '4' }).error?.issues[0]).toMatchObject({ path: ['dimension'], message: 'dimension must be 1, 2 or 3' });
    });

    it('should show all campaigns, newest change first, when no filter is given', () => {
      expect(CampaignListQuery.parse({})).toEqual({ limit: 25, offset: 0, sort: '-updatedAt', format: 'json', scope: 'all' });
    });

    it('should refuse an unknown state or method when one is asked for', () => {
      expect(CampaignListQuery.safeParse({ state: 'approved' }).success).toBe(false);
      expect(CampaignListQuery.safeParse({ method: 'lanczos' }).success).toBe(false);
    });
  });

  describe('CampaignInput', () => {
    const input = { title: 'Critical point of the 3D Anderson model', abstract: 'Finite-size scaling of Lambda near W_c at E = 0.', groupId: GROUP, roundId: ROUND, machine: 'cluster-a', spec: EXAMPLE_CAMPAIGN_SPEC };

    it('should accept a proposal and default the justification when it is left out', () => {
      const parsed = CampaignInput.parse(input);
      expect(parsed.justification).toBe('');
      expect(parsed.spec.goal).toBe('critical-point');
    });

    it('should report spec problems under spec when the spec is wrong', () => {
      const issues = CampaignInput.safeParse({ ...input, spec: { ...EXAMPLE_CAMPAIGN_SPEC, disorder: { from: 15, to: 18, step: 0 } } }).error?.issues ?? [];
      expect(issues.map((i) => [i.path, i.message])).toEqual([[['spec', 'disorder', 'step'], 'step must be greater than 0']]);
    });

    it('should refuse a short abstract with a message when it says too little', () => {
      expect(CampaignInput.safeParse({ ...input, abstract: 'short' }).error?.issues[0]).toMatchObject({ path: ['abstract'], message: 'write an abstract of at least 20 characters' });
    });
  });

  describe('CampaignPatch', () => {
    it('should leave out fields the patch did not send when only the title changes', () => {
      expect(CampaignPatch.parse({ title: '  A new title ' })).toEqual({ title: 'A new title' });
    });

    it('should refuse the group when a patch tries to move the campaign', () => {
      expect(CampaignPatch.safeParse({ groupId: GROUP }).success).toBe(false);
    });
  });
});
