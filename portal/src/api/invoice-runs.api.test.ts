import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { jsonResponse } from '../test/fetch-stub';
import { configureHttpClient } from './http-client';
import { invoiceRunsApi } from './invoice-runs.api';

describe('invoiceRunsApi', () => {
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

  const call = (i = 0) => {
    const [url, init] = fetchMock.mock.calls[i] as [string, RequestInit & { headers: Record<string, string> }];
    return { url, method: init.method, body: init.body ? JSON.parse(String(init.body)) : undefined, csrf: init.headers['x-csrf-token'] };
  };

  describe('the routes', () => {
    it('should list the runs with a plain GET and pass the abort signal on', async () => {
      const controller = new AbortController();
      await invoiceRunsApi.list(controller.signal);
      expect(call(0)).toEqual({ url: '/api/v1/invoice-runs', method: 'GET', body: undefined, csrf: undefined });
      expect((fetchMock.mock.calls[0] as [string, RequestInit])[1].signal).toBe(controller.signal);
    });

    it('should start a run for the period with the CSRF token and return the queued run of the 202', async () => {
      const queued = { id: '1d2e3f4a-5b6c-4d7e-8f9a-0b1c2d3e4f5a', periodFrom: '2027-03-01', periodTo: '2027-03-31', state: 'queued', drafted: 0, error: null, createdAt: '2027-04-01T08:00:00.000Z', finishedAt: null };
      fetchMock.mockResolvedValueOnce(jsonResponse(202, queued));
      const run = await invoiceRunsApi.start({ from: '2027-03-01', to: '2027-03-31' });
      expect(call(0)).toEqual({ url: '/api/v1/invoice-runs', method: 'POST', body: { from: '2027-03-01', to: '2027-03-31' }, csrf: 'csrf-123' });
      expect(run).toEqual(queued);
    });
  });
});
