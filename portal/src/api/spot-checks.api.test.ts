import { describe, expect, it } from 'vitest';
import { recordApiCalls } from '../test/api-calls';
import { spotChecksApi } from './spot-checks.api';

const CAMPAIGN = '3a4b5c6d-7e8f-4a0b-9c1d-2e3f4a5b6c7d';

describe('spotChecksApi', () => {
  const { call, init } = recordApiCalls({ items: [] });

  it('should list a campaign’s spot-checks with a plain GET at the api’s route', async () => {
    const answer = await spotChecksApi.list(CAMPAIGN);
    expect(call(0)).toEqual({ url: `/api/v1/campaigns/${CAMPAIGN}/spot-checks`, method: 'GET', body: undefined, csrf: undefined });
    expect(answer).toEqual({ items: [] });
  });

  it('should escape the campaign id in the path and pass the abort signal on', async () => {
    const controller = new AbortController();
    await spotChecksApi.list('a/b', controller.signal);
    expect(call(0).url).toBe('/api/v1/campaigns/a%2Fb/spot-checks');
    expect(init(0).signal).toBe(controller.signal);
  });
});
