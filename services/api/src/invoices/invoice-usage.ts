import { QueryTypes, type Transaction } from 'sequelize';
import type { CampaignMonthUsage } from '@localis/shared';
import type { Database } from '../db';

export interface PartnerUsage {
  institutionId: string;
  usage: CampaignMonthUsage[];
  /** The ledger entries the usage sums, to be marked billed with the invoice. */
  entryIds: string[];
}

/**
 * The partners' ledger debits and refunds in a period that no invoice bills yet (drafts of this
 * same period excepted: a run brings them up to date). A debit counts in the month its run ended;
 * a refund in the month it was granted, so a refund of an invoiced month is credited later rather
 * than rewriting what was issued. Grants, adjustments, transfers and expiries move core-hours
 * between accounts, not usage, and are not billed.
 */
export async function unbilledUsage(db: Database, period: { from: string; to: string }, tx: Transaction): Promise<PartnerUsage[]> {
  const rows = await db.sequelize.query<{ institution_id: string; campaign_id: string; title: string; month: string; entry_id: string; milli: string }>(
    `
    SELECT g.institution_id, c.id AS campaign_id, c.title, e.id AS entry_id, e.milli,
           to_char(CASE WHEN e.kind = 'debit' THEN r.ended_at ELSE e.created_at END AT TIME ZONE 'UTC', 'YYYY-MM') AS month
      FROM ledger_entries e
      JOIN campaigns c ON c.id = e.campaign_id
      JOIN research_groups g ON g.id = c.group_id
      JOIN institutions i ON i.id = g.institution_id AND i.kind = 'partner'
      LEFT JOIN runs r ON r.id = e.run_id
      LEFT JOIN invoice_entries b ON b.ledger_entry_id = e.id
      LEFT JOIN invoices v ON v.id = b.invoice_id
     WHERE e.kind IN ('debit', 'refund')
       AND (CASE WHEN e.kind = 'debit' THEN r.ended_at ELSE e.created_at END) >= (CAST(:from AS date) AT TIME ZONE 'UTC')
       AND (CASE WHEN e.kind = 'debit' THEN r.ended_at ELSE e.created_at END) < ((CAST(:to AS date) + 1) AT TIME ZONE 'UTC')
       AND (b.invoice_id IS NULL OR (v.state = 'draft' AND v.period_from = CAST(:from AS date) AND v.period_to = CAST(:to AS date)))
     ORDER BY g.institution_id, c.id, e.id
    `,
    { type: QueryTypes.SELECT, replacements: period, transaction: tx },
  );
  const byInstitution = new Map<string, PartnerUsage>();
  for (const row of rows) {
    let partner = byInstitution.get(row.institution_id);
    if (!partner) byInstitution.set(row.institution_id, (partner = { institutionId: row.institution_id, usage: [], entryIds: [] }));
    partner.entryIds.push(String(row.entry_id));
    // Ledger milli: debits are negative (core-hours leave the grant), refunds positive; usage is the opposite.
    const milli = -Number(row.milli);
    const same = partner.usage.find((u) => u.campaignId === row.campaign_id && u.month === row.month);
    if (same) same.netMilli += milli;
    else partner.usage.push({ month: row.month, campaignId: row.campaign_id, campaignTitle: row.title, netMilli: milli });
  }
  return [...byInstitution.values()];
}
