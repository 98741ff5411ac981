import { describe, expect, it } from 'vitest';
import { recordApiCalls } from '../test/api-calls';
import { jsonResponse } from '../test/fetch-stub';
import { ApiError } from './api-error';
import { invoicesApi } from './invoices.api';

const INVOICE = '6c1d2e3f-4a5b-4c6d-8e7f-9a0b1c2d3e4f';
const INSTITUTION = '0b6d117f-1c3a-4d1b-8a4e-9a521c0a3e0b';

describe('invoicesApi', () => {
  const { fetchMock, call, init } = recordApiCalls();

  describe('reading', () => {
    it('should list invoices with the filters in the query and leave empty ones out', async () => {
      await invoicesApi.list({ state: 'issued', institutionId: INSTITUTION, overdue: 'true' });
      await invoicesApi.list({ state: undefined, institutionId: '' });
      expect(call(0)).toEqual({ url: `/api/v1/invoices?state=issued&institutionId=${INSTITUTION}&overdue=true`, method: 'GET', body: undefined, csrf: undefined });
      expect(call(1).url).toBe('/api/v1/invoices');
    });

    it('should fetch one invoice and pass the abort signal on', async () => {
      const controller = new AbortController();
      await invoicesApi.get(INVOICE, controller.signal);
      expect(call(0)).toEqual({ url: `/api/v1/invoices/${INVOICE}`, method: 'GET', body: undefined, csrf: undefined });
      expect(init(0).signal).toBe(controller.signal);
    });

    it('should give the PDF as a plain address under the api, without a request', () => {
      expect(invoicesApi.pdfUrl(INVOICE)).toBe(`/api/v1/invoices/${INVOICE}/pdf`);
      expect(invoicesApi.pdfUrl('a/b')).toBe('/api/v1/invoices/a%2Fb/pdf');
      expect(fetchMock).not.toHaveBeenCalled();
    });
  });

  describe('changing', () => {
    it('should issue, void with the reason and ask for a payment link, each a POST with the CSRF token', async () => {
      await invoicesApi.issue(INVOICE);
      await invoicesApi.void(INVOICE, { reason: 'Billed to the wrong partner' });
      await invoicesApi.pay(INVOICE);
      expect(call(0)).toEqual({ url: `/api/v1/invoices/${INVOICE}/issue`, method: 'POST', body: undefined, csrf: 'csrf-123' });
      expect(call(1)).toEqual({ url: `/api/v1/invoices/${INVOICE}/void`, method: 'POST', body: { reason: 'Billed to the wrong partner' }, csrf: 'csrf-123' });
      expect(call(2)).toEqual({ url: `/api/v1/invoices/${INVOICE}/pay`, method: 'POST', body: undefined, csrf: 'csrf-123' });
    });

    it('should hand back the payment link as the api answers it', async () => {
      fetchMock.mockResolvedValueOnce(jsonResponse(200, { url: 'http://127.0.0.1:12111/pay/cs_test_1' }));
      expect(await invoicesApi.pay(INVOICE)).toEqual({ url: 'http://127.0.0.1:12111/pay/cs_test_1' });
    });

    it('should throw the server’s own error when it refuses', async () => {
      fetchMock.mockResolvedValueOnce(jsonResponse(409, { error: { code: 'conflict', message: 'Only a draft can be issued.' } }));
      const error = await invoicesApi.issue(INVOICE).catch((e: unknown) => e);
      expect(error).toBeInstanceOf(ApiError);
      expect(error).toMatchObject({ status: 409, code: 'conflict', message: 'Only a draft can be issued.' });
    });
  });
});
