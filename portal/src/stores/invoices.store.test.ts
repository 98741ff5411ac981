import { createPinia, setActivePinia } from 'pinia';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { jsonResponse as json, notServed, stubFetch } from '../test/fetch-stub';
import { resetTestPage } from '../test/mount-in-app';
import { draftFixture, INVOICE_ID, invoiceFixture } from '../views/billing/test/billing-fixture';
import { useInvoicesStore } from './invoices.store';

describe('useInvoicesStore', () => {
  beforeEach(() => setActivePinia(createPinia()));
  afterEach(resetTestPage);

  describe('a change the server made', () => {
    it('should show an issued draft at once in the list and on its page', async () => {
      const draft = draftFixture();
      const issued = invoiceFixture();
      stubFetch((url, init) => {
        if (url === '/api/v1/invoices') return json(200, { items: [draft] });
        if (url === `/api/v1/invoices/${INVOICE_ID}`) return json(200, draft);
        if (url === `/api/v1/invoices/${INVOICE_ID}/issue` && init?.method === 'POST') return json(200, issued);
        return notServed(url);
      });
      const store = useInvoicesStore();
      await store.load({});
      await store.loadOne(INVOICE_ID);
      await store.issue(INVOICE_ID);
      expect(store.items).toEqual([issued]);
      expect(store.current).toEqual(issued);
    });
  });

  describe('reading one invoice', () => {
    it('should keep the invoice shown while the same one is read again, and drop it for another', async () => {
      const first = invoiceFixture();
      let answer = first;
      stubFetch(() => json(200, answer));
      const store = useInvoicesStore();
      await store.loadOne(INVOICE_ID);
      const again = store.loadOne(INVOICE_ID);
      expect(store.current).toEqual(first);
      await again;
      answer = invoiceFixture({ id: '9f8e7d6c-5b4a-4392-8170-6f5e4d3c2b1a' });
      const other = store.loadOne(answer.id);
      expect(store.current).toBeNull();
      await other;
      expect(store.current?.id).toBe(answer.id);
    });
  });
});
