import { describe, expect, it } from 'vitest';
import { analysesApi } from './analyses.api';
import { recordApiCalls } from '../test/api-calls';

const CAMPAIGN = '3a4b5c6d-7e8f-4a0b-9c1d-2e3f4a5b6c7d';
const ANALYSIS = '5e6f7a8b-9c0d-4e1f-8a2b-3c4d5e6f7a8b';

describe('analysesApi', () => {
  const { call } = recordApiCalls();

  describe('the routes', () => {
    it('should list a campaign’s analyses, fetch one and request a new one with the CSRF token', async () => {
      await analysesApi.list(CAMPAIGN);
      await analysesApi.get(ANALYSIS);
      await analysesApi.request(CAMPAIGN, { orders: { nr: 3, ni: 0, mr: 1, mi: 0 }, sizes: [8, 12, 16], bootstrap: 200 });
      expect(call(0)).toEqual({ url: `/api/v1/campaigns/${CAMPAIGN}/analyses`, method: 'GET', body: undefined, csrf: undefined });
      expect(call(1)).toMatchObject({ url: `/api/v1/analyses/${ANALYSIS}`, method: 'GET' });
      expect(call(2)).toEqual({
        url: `/api/v1/campaigns/${CAMPAIGN}/analyses`,
        method: 'POST',
        body: { orders: { nr: 3, ni: 0, mr: 1, mi: 0 }, sizes: [8, 12, 16], bootstrap: 200 },
        csrf: 'csrf-123',
      });
    });
  });
});
