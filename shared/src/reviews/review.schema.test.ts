import { describe, expect, it } from 'vitest';
import { DecisionInput, ReviewInput } from './review.schema';

const REVIEW = {
  scores: { merit: 4, feasibility: 3, costJustification: 5 },
  toProposers: 'The sizes reach far enough to pin down nu.',
  recommendedCoreHours: 1_536,
};
const DECISION_MESSAGE = 'The committee grants the campaign as proposed.';

const issuesOf = (schema: typeof ReviewInput | typeof DecisionInput, value: unknown) => {
  const result = schema.safeParse(value);
  expect(result.success, 'the input should have been refused').toBe(false);
  return (result.error?.issues ?? []).map((i) => [i.path, i.message]);
};

describe('ReviewInput', () => {
  it('should accept scores from 1 to 5 and default the confidential comment to empty', () => {
    expect(ReviewInput.parse(REVIEW).confidential).toBe('');
    expect(ReviewInput.safeParse({ ...REVIEW, scores: { merit: 1, feasibility: 5, costJustification: 1 } }).success).toBe(true);
  });

  it('should refuse scores of 0 and 6 at their criterion, with the range in the message', () => {
    expect(issuesOf(ReviewInput, { ...REVIEW, scores: { merit: 0, feasibility: 6, costJustification: 3 } })).toEqual([
      [['scores', 'merit'], 'scores run from 1 (poor) to 5 (excellent)'],
      [['scores', 'feasibility'], 'scores run from 1 (poor) to 5 (excellent)'],
    ]);
  });

  it('should refuse a fractional score and a missing one', () => {
    expect(issuesOf(ReviewInput, { ...REVIEW, scores: { merit: 3.5, feasibility: 3 } })).toEqual([
      [['scores', 'merit'], 'scores are whole numbers from 1 to 5'],
      [['scores', 'costJustification'], 'give a score from 1 to 5'],
    ]);
  });

  it('should refuse a comment for the proposers shorter than a sentence', () => {
    expect(issuesOf(ReviewInput, { ...REVIEW, toProposers: 'ok' })).toEqual([[['toProposers'], 'write at least a sentence for the proposers']]);
  });

  it('should accept 0 recommended core-hours, a decline, and refuse negative ones', () => {
    expect(ReviewInput.safeParse({ ...REVIEW, recommendedCoreHours: 0 }).success).toBe(true);
    expect(issuesOf(ReviewInput, { ...REVIEW, recommendedCoreHours: -1 })).toEqual([[['recommendedCoreHours'], 'core-hours are not negative']]);
  });
});

describe('DecisionInput', () => {
  it('should accept grant-all and decline without core-hours and grant-part with them', () => {
    expect(DecisionInput.safeParse({ outcome: 'grant-all', message: DECISION_MESSAGE }).success).toBe(true);
    expect(DecisionInput.safeParse({ outcome: 'decline', message: DECISION_MESSAGE }).success).toBe(true);
    expect(DecisionInput.parse({ outcome: 'grant-part', coreHours: 1_000, message: DECISION_MESSAGE }).coreHours).toBe(1_000);
  });

  it('should refuse grant-part without core-hours, at coreHours', () => {
    expect(issuesOf(DecisionInput, { outcome: 'grant-part', message: DECISION_MESSAGE })).toEqual([[['coreHours'], 'give the core-hours of a partial grant']]);
  });

  it('should refuse decline and grant-all with core-hours, at coreHours', () => {
    expect(issuesOf(DecisionInput, { outcome: 'decline', coreHours: 500, message: DECISION_MESSAGE })).toEqual([[['coreHours'], 'leave core-hours out for decline']]);
    expect(issuesOf(DecisionInput, { outcome: 'grant-all', coreHours: 500, message: DECISION_MESSAGE })).toEqual([[['coreHours'], 'leave core-hours out for grant-all']]);
  });

  it('should refuse an unknown outcome and a partial grant of 0', () => {
    expect(issuesOf(DecisionInput, { outcome: 'maybe', message: DECISION_MESSAGE })).toEqual([[['outcome'], 'choose grant-all, grant-part or decline']]);
    expect(issuesOf(DecisionInput, { outcome: 'grant-part', coreHours: 0, message: DECISION_MESSAGE })).toEqual([[['coreHours'], 'grant at least 1 core-hour']]);
  });
});
