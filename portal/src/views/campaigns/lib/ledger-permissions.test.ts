import { describe, expect, it } from 'vitest';
import { holdsGrant, ledgerPermissions } from './ledger-permissions';

const nothing = { transfer: false, recordRuns: false };

describe('ledger-permissions', () => {
  describe('holdsGrant', () => {
    it('should count granted and partly granted campaigns only', () => {
      expect(holdsGrant('granted')).toBe(true);
      expect(holdsGrant('partly-granted')).toBe(true);
      expect(holdsGrant('in-review')).toBe(false);
      expect(holdsGrant('declined')).toBe(false);
    });
  });

  describe('ledgerPermissions', () => {
    it('should offer adjustments and refunds to the office when the campaign holds a grant', () => {
      expect(ledgerPermissions(['admin'], { state: 'partly-granted', can: { transfer: true, recordRuns: true } })).toEqual({ adjust: true, refund: true, transfer: true, recordRuns: true });
    });

    it('should follow the server on transfers and runs for the group', () => {
      expect(ledgerPermissions(['pi'], { state: 'granted', can: { transfer: true, recordRuns: true } })).toEqual({ adjust: false, refund: false, transfer: true, recordRuns: true });
      expect(ledgerPermissions(['researcher'], { state: 'granted', can: { transfer: false, recordRuns: true } })).toEqual({ adjust: false, refund: false, transfer: false, recordRuns: true });
    });

    it('should offer nothing to the committee', () => {
      expect(ledgerPermissions(['committee'], { state: 'granted', can: nothing })).toEqual({ adjust: false, refund: false, transfer: false, recordRuns: false });
    });

    it('should offer the office nothing when the campaign holds no grant', () => {
      expect(Object.values(ledgerPermissions(['admin'], { state: 'in-review', can: nothing })).some(Boolean)).toBe(false);
    });
  });
});
