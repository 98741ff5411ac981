import type { Migration } from '../src/db/migrator';

/**
 * The ledger after review: a refund after an expiry must be able to expire too (so more than one
 * expiry entry per campaign), lookups by run need their own index, TRUNCATE is refused like
 * UPDATE and DELETE, and a transfer never names its own campaign as the other side.
 */
export const up: Migration['up'] = async ({ sequelize }) => {
  await sequelize.transaction(async (transaction) => {
    await sequelize.query(
      `
      DROP INDEX ledger_one_expiry;
      CREATE INDEX ledger_entries_run ON ledger_entries (run_id) WHERE run_id IS NOT NULL;
      ALTER TABLE ledger_entries ADD CONSTRAINT ledger_counterpart_other CHECK (counterpart_campaign_id IS NULL OR counterpart_campaign_id <> campaign_id);
      CREATE TRIGGER ledger_entries_no_truncate BEFORE TRUNCATE ON ledger_entries
        FOR EACH STATEMENT EXECUTE FUNCTION ledger_entries_append_only();
      `,
      { transaction },
    );
  });
};

export const down: Migration['down'] = async ({ sequelize }) => {
  await sequelize.transaction(async (transaction) => {
    await sequelize.query(
      `
      DROP TRIGGER IF EXISTS ledger_entries_no_truncate ON ledger_entries;
      ALTER TABLE ledger_entries DROP CONSTRAINT IF EXISTS ledger_counterpart_other;
      DROP INDEX IF EXISTS ledger_entries_run;
      CREATE UNIQUE INDEX ledger_one_expiry ON ledger_entries (campaign_id) WHERE kind = 'expiry';
      `,
      { transaction },
    );
  });
};
