import { describe, expect, it } from 'vitest';
import { draftFixture, invoiceFixture, KESTREL_ID, ORRIN_ID } from '../test/billing-fixture';
import { billingShowOf, billingShowValue, invoiceQueryProblems, invoicesPage, invoicesQueryOf, sortInvoices } from './invoice-list';

const march = invoiceFixture({ id: 'a', number: 'LOC-2027-0007', periodFrom: '2027-03-01', periodTo: '2027-03-31', dueOn: '2027-05-02' });
const february = invoiceFixture({ id: 'b', number: 'LOC-2027-0003', periodFrom: '2027-02-01', periodTo: '2027-02-28', state: 'paid', dueOn: '2027-04-01' });
const draft = draftFixture({ id: 'c', periodFrom: '2027-04-01', periodTo: '2027-04-30' });

describe('invoice-list', () => {
  describe('a billing contact’s views', () => {
    it('should show what is to pay by default and keep the default out of the address', () => {
      expect(billingShowOf({})).toBe('open');
      expect(billingShowOf({ show: 'nonsense' })).toBe('open');
      expect(billingShowOf({ show: 'paid' })).toBe('paid');
      expect([billingShowValue('open'), billingShowValue('overdue')]).toEqual([null, 'overdue']);
    });

    it('should ask the api for issued, overdue, paid or every invoice', () => {
      expect(['open', 'overdue', 'paid', 'all'].map((show) => invoicesQueryOf({ show }, false))).toEqual([{ state: 'issued' }, { overdue: 'true' }, { state: 'paid' }, {}]);
    });

    it('should ignore the office’s filters when the reader is only a billing contact', () => {
      expect(invoicesQueryOf({ state: 'draft', institutionId: KESTREL_ID }, false)).toEqual({ state: 'issued' });
    });
  });

  describe('the office’s filters', () => {
    it('should pass the filters on as they are and leave out empty ones', () => {
      expect(invoicesQueryOf({ state: 'issued', institutionId: ORRIN_ID, overdue: 'true', show: 'paid' }, true)).toEqual({ state: 'issued', institutionId: ORRIN_ID, overdue: 'true' });
      expect(invoicesQueryOf({}, true)).toEqual({});
    });

    it('should explain a hand-edited address in the api schema’s words, by field', () => {
      expect(invoiceQueryProblems({ state: 'issued', institutionId: ORRIN_ID })).toEqual({});
      expect(Object.keys(invoiceQueryProblems({ institutionId: 'orrin' } as never))).toEqual(['institutionId']);
      expect(invoiceQueryProblems({ institutionId: 'orrin' } as never).institutionId).toBe('institutionId must be an institution id');
      expect(Object.keys(invoiceQueryProblems({ state: 'late' } as never))).toEqual(['state']);
    });
  });

  describe('order and pages', () => {
    it('should put the latest period first by default', () => {
      expect(sortInvoices([february, draft, march], '-periodFrom').map((i) => i.id)).toEqual(['c', 'a', 'b']);
    });

    it('should put drafts, which have no number or due date, last either way', () => {
      expect(sortInvoices([draft, march, february], 'number').map((i) => i.id)).toEqual(['b', 'a', 'c']);
      expect(sortInvoices([draft, march, february], '-number').map((i) => i.id)).toEqual(['a', 'b', 'c']);
      expect(sortInvoices([draft, march, february], '-dueOn').map((i) => i.id)).toEqual(['a', 'b', 'c']);
    });

    it('should sort states in the order an invoice lives them', () => {
      expect(sortInvoices([february, march, draft], 'state').map((i) => i.state)).toEqual(['draft', 'issued', 'paid']);
    });

    it('should cut one page of the sorted list', () => {
      expect(invoicesPage([february, draft, march], { page: 2, limit: 2, sort: '-periodFrom' }).map((i) => i.id)).toEqual(['b']);
    });
  });
});
