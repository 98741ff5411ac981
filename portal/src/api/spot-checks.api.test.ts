import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { jsonResponse } from '../test/fetch-stub';
import { configureHttpClient } from './http-client';
import { spotChecksApi } from './spot-checks.api';

const CAMPAIGN = '3a4b5c6d-7e8f-4a0b-9c1d-2e3f4a5b6c7d';

describe('spotChecksApi', () => {
  let fetchMock: ReturnType<typeof vi.fn>;

  beforeEach(() => {
    fetchMock = vi.fn(() => Promise.resolve(jsonResponse(200, { items: [] })));
    vi.stubGlobal('fetch', fetchMock);
    configureHttpClient({ csrfToken: () => 'csrf-123' });
  });

  afterEach(() => {
    vi.unstubAllGlobals();
    configureHttpClient({ csrfToken: () => null });
  });

  it('should list a campaign’s spot-checks with a plain GET at the api’s route', async () => {
    const answer = await spotChecksApi.list(CAMPAIGN);
    const [url, init] = fetchMock.mock.calls[0] as [string, RequestInit & { headers: Record<string, string> }];
    expect({ url, method: init.method, body: init.body, csrf: init.headers['x-csrf-token'] }).toEqual({
      url: `/api/v1/campaigns/${CAMPAIGN}/spot-checks`,
      method: 'GET',
      body: undefined,
      csrf: undefined,
    });
    expect(answer).toEqual({ items: [] });
  });

  it('should escape the campaign id in the path and pass the abort signal on', async () => {
    const controller = new AbortController();
    await spotChecksApi.list('a/b', controller.signal);
    const [url, init] = fetchMock.mock.calls[0] as [string, RequestInit];
    expect(url).toBe('/api/v1/campaigns/a%2Fb/spot-checks');
    expect(init.signal).toBe(controller.signal);
  });
});
