import type { LedgerEntry } from '@localis/shared';
import { describe, expect, it } from 'vitest';
import { ledgerCsvFileName, ledgerEntriesCsv } from './ledger-entries-csv';

const debit: LedgerEntry = {
  id: '42',
  campaignId: '11111111-1111-4111-8111-111111111111',
  kind: 'debit',
  coreHours: -1536.25,
  balanceAfter: -36.25,
  runId: '22222222-2222-4222-8222-222222222222',
  externalJobId: '981234',
  counterpartCampaignId: null,
  counterpartTitle: null,
  reason: null,
  overdraft: true,
  actorName: 'Ilse Varga',
  createdAt: '2027-04-03T12:00:00.000Z',
};

describe('ledger-entries-csv', () => {
  describe('ledgerEntriesCsv', () => {
    it('should write a header and one line per entry with numbers kept as numbers', () => {
      const lines = ledgerEntriesCsv([debit]).trimEnd().split('\r\n');
      expect(lines[0]).toBe('createdAt,kind,coreHours,balanceAfter,externalJobId,counterpartTitle,reason,overdraft,actorName,id');
      expect(lines[1]).toBe('2027-04-03T12:00:00.000Z,Run,-1536.25,-36.25,981234,,,yes,Ilse Varga,42');
    });

    it('should quote reasons with commas and neutralise text that a spreadsheet would run', () => {
      const csv = ledgerEntriesCsv([{ ...debit, kind: 'adjustment', reason: '=SUM(A1), fixed', overdraft: false }]);
      expect(csv).toContain(`"'=SUM(A1), fixed"`);
      expect(csv).toContain(',Adjustment,');
    });
  });

  describe('ledgerCsvFileName', () => {
    it('should name the file after the campaign and the day', () => {
      expect(ledgerCsvFileName('Critical disorder of the 3D Anderson model', new Date('2027-04-05T10:00:00Z'))).toBe(
        'ledger-critical-disorder-of-the-3d-anderson-model-2027-04-05.csv',
      );
      expect(ledgerCsvFileName('ΔΛ', new Date('2027-04-05T10:00:00Z'))).toBe('ledger-campaign-2027-04-05.csv');
    });
  });
});
