import type { Invoice, Role } from '@localis/shared';
import { describe, expect, it } from 'vitest';
import { invoiceActions } from './invoice-actions';

const of = (roles: Role[], state: Invoice['state'], over: Partial<Pick<Invoice, 'hasPdf' | 'paymentState'>> = {}) =>
  invoiceActions(roles, { state, hasPdf: state !== 'draft', paymentState: null, ...over });

describe('invoiceActions', () => {
  describe('the office', () => {
    it('should issue a draft and nothing else when the invoice is a draft', () => {
      expect(of(['admin'], 'draft')).toEqual({ issue: true, void: false, pay: false, pdf: false });
    });

    it('should void, pay and download when the invoice is issued', () => {
      expect(of(['admin'], 'issued')).toEqual({ issue: false, void: true, pay: true, pdf: true });
    });

    it('should only download when the invoice is paid or void', () => {
      expect(of(['admin'], 'paid')).toEqual({ issue: false, void: false, pay: false, pdf: true });
      expect(of(['admin'], 'void')).toEqual({ issue: false, void: false, pay: false, pdf: true });
    });
  });

  describe('a billing contact', () => {
    it('should pay and download an issued invoice but neither issue nor void', () => {
      expect(of(['billing'], 'issued')).toEqual({ issue: false, void: false, pay: true, pdf: true });
    });

    it('should not pay again when the provider already reported the payment made', () => {
      expect(of(['billing'], 'issued', { paymentState: 'succeeded' }).pay).toBe(false);
      expect(of(['billing'], 'issued', { paymentState: 'failed' }).pay).toBe(true);
      expect(of(['billing'], 'issued', { paymentState: 'pending' }).pay).toBe(true);
    });

    it('should offer no download when no PDF is stored', () => {
      expect(of(['billing'], 'issued', { hasPdf: false }).pdf).toBe(false);
    });
  });

  it('should offer nothing to anyone else', () => {
    expect(of(['researcher', 'pi'], 'issued', { hasPdf: false })).toEqual({ issue: false, void: false, pay: false, pdf: false });
  });
});
