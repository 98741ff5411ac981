import { describe, expect, it } from 'vitest';
import { recordApiCalls } from '../test/api-calls';
import { jsonResponse } from '../test/fetch-stub';
import { invoiceRunsApi } from './invoice-runs.api';

describe('invoiceRunsApi', () => {
  const { fetchMock, call, init } = recordApiCalls({ items: [] });

  describe('the routes', () => {
    it('should list the runs with a plain GET and pass the abort signal on', async () => {
      const controller = new AbortController();
      await invoiceRunsApi.list(controller.signal);
      expect(call(0)).toEqual({ url: '/api/v1/invoice-runs', method: 'GET', body: undefined, csrf: undefined });
      expect(init(0).signal).toBe(controller.signal);
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
