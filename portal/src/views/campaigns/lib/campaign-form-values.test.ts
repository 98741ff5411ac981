import { CampaignInput, CampaignSpec } from '@localis/shared';
import { describe, expect, it } from 'vitest';
import { fieldErrors } from '../../../composables/use-zod-form';
import { newCampaignValues, parseList, parseNumber, specFormValues, toCampaignInput, toCampaignPatch, toSpecInput } from './campaign-form-values';

const GROUP = '5d0c2b3e-8f4a-4c1d-9e2b-7a6f5e4d3c21';
const ROUND = '9a8b7c6d-5e4f-4a3b-8c2d-1e0f9a8b7c6d';

function filled() {
  const v = newCampaignValues();
  v.title = 'Critical disorder of the 3D Anderson model';
  v.abstract = 'Locate W_c at E = 0 by finite-size scaling of the transfer-matrix Lyapunov exponent.';
  v.groupId = GROUP;
  v.roundId = ROUND;
  v.machine = 'cluster-a';
  return v;
}

describe('campaign form values', () => {
  describe('reading text boxes', () => {
    it('should read numbers and lists the way people type them when the text is valid', () => {
      expect(parseNumber(' 0.25 ')).toBe(0.25);
      expect(parseNumber('−1')).toBe(-1);
      expect(parseNumber('')).toBeUndefined();
      expect(parseList('6, 8 12;16')).toEqual([6, 8, 12, 16]);
      expect(parseList('')).toEqual([]);
    });

    it('should keep junk as NaN when a token is not a number, so the schema can name it', () => {
      expect(parseNumber('abc')).toBeNaN();
      expect(parseList('8, x')[1]).toBeNaN();
    });
  });

  describe('the input the schema checks', () => {
    it('should make a valid CampaignInput when a new form is filled in', () => {
      const parsed = CampaignInput.parse(toCampaignInput(filled()));

      expect(parsed.spec.sizes).toEqual([6, 8, 12, 16]);
      expect(parsed.spec.disorder).toEqual({ from: 15, to: 18, step: 0.25 });
      expect(parsed.spec.targetPrecision).toBe(0.005);
      expect(parsed.spec.pilotTimings).toBeUndefined();
    });

    it('should send only the options of the chosen method when another method was edited before', () => {
      const v = filled();
      v.spec.methodOptions.moments = '2048';
      v.spec.methodOptions.expectedLambda = '0.6';
      v.spec.method = 'kernel-polynomial';

      const spec = CampaignSpec.parse(toSpecInput(v.spec));

      expect(spec.methodOptions).toEqual({ moments: 2048 });
      expect(spec.targetPrecision).toBeUndefined();
    });

    it('should give errors under nested paths when the grid is wrong', () => {
      const v = filled();
      v.spec.disorder.step = '0';
      v.spec.sizes = '6, 6';
      v.spec.node.memoryGiBPerNode = '';

      const result = CampaignInput.safeParse(toCampaignInput(v));
      expect(result.success).toBe(false);
      const errors = fieldErrors(result.error!.issues, true);

      expect(errors['spec.disorder.step']).toBe('step must be greater than 0');
      expect(errors['spec.sizes']).toBe('each size may appear only once');
      expect(errors['spec.node.memoryGiBPerNode']).toBeDefined();
    });

    it('should use a list of disorder values when that mode is chosen', () => {
      const v = filled();
      v.spec.disorder = { mode: 'values', from: '15', to: '18', step: '0.25', values: '15, 16.5, 18' };

      expect((toSpecInput(v.spec) as { disorder: unknown }).disorder).toEqual({ values: [15, 16.5, 18] });
    });

    it('should leave the group out of a patch, since a draft keeps its group', () => {
      const input = CampaignInput.parse(toCampaignInput(filled()));

      const patch = toCampaignPatch(input);

      expect(patch).not.toHaveProperty('groupId');
      expect(patch.roundId).toBe(ROUND);
      expect(patch.spec?.sizes).toEqual([6, 8, 12, 16]);
    });
  });

  describe('a saved campaign in the form', () => {
    it('should give back the same specification when a saved spec is loaded and read again', () => {
      const spec = CampaignSpec.parse({
        model: 'anderson-gaussian',
        dimension: 2,
        symmetryClass: 'AII',
        goal: 'critical-point',
        sizes: [32, 64, 128],
        disorder: { values: [5.5, 5.75, 6] },
        energies: [0, 0.5],
        realizations: 200,
        method: 'kernel-polynomial',
        methodOptions: { moments: 4096, randomVectors: 16 },
        node: { coresPerNode: 128, memoryGiBPerNode: 512 },
        pilotTimings: [
          { size: 16, seconds: 10, cores: 1 },
          { size: 32, seconds: 40, cores: 1 },
        ],
      });

      expect(CampaignSpec.parse(toSpecInput(specFormValues(spec)))).toEqual(spec);
    });
  });
});
