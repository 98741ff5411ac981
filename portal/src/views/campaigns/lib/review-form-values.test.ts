import { ReviewInput, type Review } from '@localis/shared';
import { describe, expect, it } from 'vitest';
import { fieldErrors } from '../../../composables/use-zod-form';
import { firstInvalidFieldId, REVIEW_FIELD_IDS, reviewFormValues } from './review-form-values';

const SAVED: Review = {
  scores: { merit: 4, feasibility: 3, costJustification: 5 },
  toProposers: 'A clear plan; the largest size adds little.',
  confidential: 'The group delivered on its last grant.',
  recommendedCoreHours: 900_000,
  submittedAt: '2027-02-01T10:00:00.000Z',
  updatedAt: '2027-02-02T10:00:00.000Z',
};

describe('review-form-values', () => {
  describe('reviewFormValues', () => {
    it('should start blank with no score chosen when there is no review yet', () => {
      expect(reviewFormValues(null)).toEqual({
        scores: { merit: null, feasibility: null, costJustification: null },
        toProposers: '',
        confidential: '',
        recommendedCoreHours: null,
      });
    });

    it('should hold the saved review and parse back to it when editing', () => {
      const values = reviewFormValues(SAVED);
      expect(ReviewInput.parse(values)).toEqual({
        scores: SAVED.scores,
        toProposers: SAVED.toProposers,
        confidential: SAVED.confidential,
        recommendedCoreHours: SAVED.recommendedCoreHours,
      });
    });

    it('should key the errors of a blank form by the dotted paths the form shows them beside', () => {
      const result = ReviewInput.safeParse(reviewFormValues(null));
      expect(result.success).toBe(false);
      const errors = fieldErrors(result.error!.issues, true);
      expect(Object.keys(errors).every((key) => key in REVIEW_FIELD_IDS)).toBe(true);
      expect(errors['scores.merit']).toBe('give a score from 1 to 5');
      expect(errors.recommendedCoreHours).toBe('recommend a number of core-hours (0 to decline)');
    });
  });

  describe('firstInvalidFieldId', () => {
    it('should pick the first field in reading order when several have errors', () => {
      expect(firstInvalidFieldId({ recommendedCoreHours: 'x', 'scores.feasibility': 'y', toProposers: 'z' })).toBe('review-score-feasibility');
    });

    it('should give null when nothing is wrong', () => {
      expect(firstInvalidFieldId({})).toBeNull();
    });
  });
});
