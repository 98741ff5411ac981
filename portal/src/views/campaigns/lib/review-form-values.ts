import { REVIEW_CRITERIA, type Review, type ReviewCriterion } from '@localis/shared';

/** What the review form's inputs hold: a score not chosen yet, an empty number box, is null. */
export interface ReviewFormValues {
  scores: Record<ReviewCriterion, number | null>;
  toProposers: string;
  confidential: string;
  recommendedCoreHours: number | null;
}

/** The form filled from the saved review, or blank for a first review. */
export function reviewFormValues(review: Review | null | undefined): ReviewFormValues {
  const scores = Object.fromEntries(REVIEW_CRITERIA.map((c) => [c, review?.scores[c] ?? null])) as Record<ReviewCriterion, number | null>;
  return {
    scores,
    toProposers: review?.toProposers ?? '',
    confidential: review?.confidential ?? '',
    recommendedCoreHours: review?.recommendedCoreHours ?? null,
  };
}

/** The id of each field's input, by the key its errors come under (dotted paths, see `errorKey`). */
export const REVIEW_FIELD_IDS: Record<string, string> = {
  'scores.merit': 'review-score-merit',
  'scores.feasibility': 'review-score-feasibility',
  'scores.costJustification': 'review-score-cost-justification',
  toProposers: 'review-to-proposers',
  confidential: 'review-confidential',
  recommendedCoreHours: 'review-recommended',
};

/** Where the keyboard goes after a refused save: the first field, in reading order, with an error. */
export function firstInvalidFieldId(errors: Record<string, string>): string | null {
  const key = Object.keys(REVIEW_FIELD_IDS).find((k) => errors[k]);
  return key ? REVIEW_FIELD_IDS[key] : null;
}
