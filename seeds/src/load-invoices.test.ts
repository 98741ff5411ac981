import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { loadSettings, REVERSE_CHARGE_NOTE, type InvoiceLine } from '@localis/shared';
import { InvoiceRow, openDatabase, type Database } from '@localis/api/db';
import { createServices } from '@localis/api/services';
import { adminContext } from './seed-context';

/** The demo partner's invoices, as `npm test` loaded them before the suites. */
const ORRIN = '1a000000-0000-4000-8000-000000000003';
const settings = loadSettings(process.env);
let db: Database;
beforeAll(() => {
  db = openDatabase(settings, { poolMax: 2 });
});
afterAll(async () => db.close());

describe('the demo partner’s invoices', () => {
  it('should be issued month by month, numbered in order, all paid but the newest', async () => {
    const rows = await InvoiceRow.findAll({ where: { institutionId: ORRIN }, order: [['periodFrom', 'ASC']] });
    // Issued by the scenario, for months before the load: other tests issue invoices of far-off months of their own.
    const today = new Date().toISOString().slice(0, 10);
    const demo = rows.filter((r) => r.number !== null && r.periodTo < today);
    expect(demo.length).toBeGreaterThanOrEqual(2);
    expect(demo.slice(0, -1).every((r) => r.state === 'paid')).toBe(true);
    expect(demo.at(-1)!.state).toBe('issued');
    const numbers = demo.map((r) => Number(r.number!.slice(-4)));
    expect(numbers).toEqual(numbers.map((_, i) => numbers[0]! + i));
    for (const r of demo) {
      expect(r.pdfObjectKey).not.toBeNull();
      expect(r.issuedOn! > r.periodTo).toBe(true);
    }
  });

  it('should bill exactly the partner’s ledger usage of each month, with the reverse-charge note', async () => {
    const services = createServices(db, settings);
    const { items } = await services.invoices.list(adminContext(), { institutionId: ORRIN });
    for (const invoice of items.filter((i) => i.number !== null)) {
      const [usage] = await db.sequelize.query<{ milli: string }>(
        `SELECT coalesce(-sum(e.milli), 0) AS milli FROM invoice_entries b JOIN ledger_entries e ON e.id = b.ledger_entry_id WHERE b.invoice_id = :id`,
        { type: QueryTypes.SELECT, replacements: { id: invoice.id } },
      );
      expect((invoice.lines as InvoiceLine[]).reduce((a, l) => a + l.coreHoursMilli, 0)).toBe(Number(usage!.milli));
      expect(invoice).toMatchObject({ currency: 'EUR', reverseCharge: true, taxMinor: 0 });
      expect(invoice.notes).toContain(REVERSE_CHARGE_NOTE);
    }
  });
});
