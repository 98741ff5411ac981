import type { Migration } from '../src/db/migrator';

/** Reproducibility spot-checks of verified result archives (the worker recomputes a few points). */
export const up: Migration['up'] = async ({ sequelize }) => {
  await sequelize.transaction(async (transaction) => {
    await sequelize.query(
      `
      CREATE TABLE spot_checks (
        id uuid PRIMARY KEY,
        archive_id uuid NOT NULL UNIQUE REFERENCES archives(id) ON DELETE RESTRICT,
        campaign_id uuid NOT NULL REFERENCES campaigns(id) ON DELETE RESTRICT,
        state text NOT NULL DEFAULT 'queued' CHECK (state IN ('queued', 'running', 'done', 'not-applicable', 'failed')),
        progress jsonb,
        rows jsonb NOT NULL DEFAULT '[]',
        flagged integer NOT NULL DEFAULT 0 CHECK (flagged >= 0),
        reason text,
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        started_at timestamptz,
        finished_at timestamptz,
        CHECK ((state IN ('not-applicable', 'failed')) = (reason IS NOT NULL)),
        CHECK (state <> 'done' OR jsonb_array_length(rows) > 0)
      );
      CREATE INDEX spot_checks_campaign ON spot_checks (campaign_id, created_at DESC);

      ALTER TABLE provenance_entries DROP CONSTRAINT provenance_entries_kind_check;
      ALTER TABLE provenance_entries ADD CONSTRAINT provenance_entries_kind_check
        CHECK (kind IN ('run-recorded', 'grant-decided', 'archive-verified', 'archive-withdrawn', 'analysis-computed', 'spot-check-computed'));
      `,
      { transaction },
    );
  });
};

export const down: Migration['down'] = async ({ sequelize }) => {
  await sequelize.transaction(async (transaction) => {
    await sequelize.query(
      `
      DROP TABLE IF EXISTS spot_checks;
      ALTER TABLE provenance_entries DROP CONSTRAINT provenance_entries_kind_check;
      ALTER TABLE provenance_entries ADD CONSTRAINT provenance_entries_kind_check
        CHECK (kind IN ('run-recorded', 'grant-decided', 'archive-verified', 'archive-withdrawn', 'analysis-computed'));
      `,
      { transaction },
    );
  });
};
