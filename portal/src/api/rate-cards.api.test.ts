import { describe, expect, it } from 'vitest';
import { recordApiCalls } from '../test/api-calls';
import { jsonResponse } from '../test/fetch-stub';
import { ApiError } from './api-error';
import { rateCardsApi } from './rate-cards.api';

const INSTITUTION = '0b6d117f-1c3a-4d1b-8a4e-9a521c0a3e0b';
const INPUT = { currency: 'EUR', unitPriceMinor: 250, tiers: [], discountBasisPoints: 0, taxRateBasisPoints: 2100, reverseCharge: false, paymentTermsDays: 30, effectiveFrom: '2027-01-01' };

describe('rateCardsApi', () => {
  const { fetchMock, call } = recordApiCalls({ items: [] });

  describe('the routes', () => {
    it('should list a partner’s cards under the institution with a plain GET', async () => {
      await rateCardsApi.list(INSTITUTION);
      expect(call(0)).toEqual({ url: `/api/v1/institutions/${INSTITUTION}/rate-cards`, method: 'GET', body: undefined, csrf: undefined });
    });

    it('should add a card with the CSRF token and escape the institution id', async () => {
      await rateCardsApi.create(INSTITUTION, INPUT);
      await rateCardsApi.create('a/b', INPUT);
      expect(call(0)).toEqual({ url: `/api/v1/institutions/${INSTITUTION}/rate-cards`, method: 'POST', body: INPUT, csrf: 'csrf-123' });
      expect(call(1).url).toBe('/api/v1/institutions/a%2Fb/rate-cards');
    });
  });

  describe('refusals', () => {
    it('should carry the field details of a 422 so the form can put them beside the fields', async () => {
      const details = [{ path: ['tiers', 1, 'fromCoreHours'], message: 'each tier must start above the one before' }];
      fetchMock.mockResolvedValueOnce(jsonResponse(422, { error: { code: 'invalid', message: 'Some fields of the body are not valid.', details } }));
      const error = (await rateCardsApi.create(INSTITUTION, INPUT).catch((e: unknown) => e)) as ApiError;
      expect(error).toBeInstanceOf(ApiError);
      expect({ status: error.status, code: error.code, details: error.details }).toEqual({ status: 422, code: 'invalid', details });
    });
  });
});
