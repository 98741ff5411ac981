import type { Migration } from '../src/db/migrator';

/**
 * Committee review, the core-hour ledger, runs, idempotent writes and notifications.
 * Ledger amounts are integer milli-core-hours (see shared/src/ledger/ledger-math.ts).
 */
export const up: Migration['up'] = async ({ sequelize }) => {
  await sequelize.transaction(async (transaction) => {
    await sequelize.query(
      `
      ALTER TABLE rounds
        ADD COLUMN allocation_ends_at timestamptz,
        ADD COLUMN overdraft_percent smallint NOT NULL DEFAULT 0 CHECK (overdraft_percent BETWEEN 0 AND 50),
        ADD COLUMN closing_notice_sent_at timestamptz;
      UPDATE rounds SET allocation_ends_at = closes_at + interval '365 days';
      ALTER TABLE rounds ALTER COLUMN allocation_ends_at SET NOT NULL,
        ADD CONSTRAINT rounds_allocation_after_close CHECK (allocation_ends_at > closes_at);

      ALTER TABLE people ADD COLUMN mail_preferences jsonb NOT NULL DEFAULT '{}'::jsonb;

      CREATE TABLE review_assignments (
        id uuid PRIMARY KEY,
        campaign_id uuid NOT NULL REFERENCES campaigns(id) ON DELETE CASCADE,
        reviewer_person_id uuid NOT NULL REFERENCES people(id) ON DELETE RESTRICT,
        state text NOT NULL DEFAULT 'assigned' CHECK (state IN ('assigned', 'reviewed', 'conflict')),
        conflict_reason text,
        assigned_by_person_id uuid REFERENCES people(id) ON DELETE SET NULL,
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        UNIQUE (campaign_id, reviewer_person_id),
        CHECK ((state = 'conflict') = (conflict_reason IS NOT NULL))
      );
      CREATE INDEX review_assignments_reviewer ON review_assignments (reviewer_person_id);

      CREATE TABLE reviews (
        assignment_id uuid PRIMARY KEY REFERENCES review_assignments(id) ON DELETE CASCADE,
        merit smallint NOT NULL CHECK (merit BETWEEN 1 AND 5),
        feasibility smallint NOT NULL CHECK (feasibility BETWEEN 1 AND 5),
        cost_justification smallint NOT NULL CHECK (cost_justification BETWEEN 1 AND 5),
        to_proposers text NOT NULL,
        confidential text NOT NULL DEFAULT '',
        recommended_core_hours bigint NOT NULL CHECK (recommended_core_hours >= 0),
        submitted_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now()
      );

      CREATE TABLE runs (
        id uuid PRIMARY KEY,
        campaign_id uuid NOT NULL REFERENCES campaigns(id) ON DELETE RESTRICT,
        external_job_id text NOT NULL,
        machine text NOT NULL,
        started_at timestamptz NOT NULL,
        ended_at timestamptz NOT NULL,
        cores integer NOT NULL CHECK (cores > 0),
        core_hours_milli bigint NOT NULL CHECK (core_hours_milli > 0),
        code_name text NOT NULL,
        code_version text NOT NULL,
        parameters jsonb NOT NULL,
        source text NOT NULL CHECK (source IN ('portal', 'api', 'import')),
        recorded_by_person_id uuid REFERENCES people(id) ON DELETE SET NULL,
        created_at timestamptz NOT NULL DEFAULT now(),
        -- A scheduler's job ids are unique on its machine: the same job is never charged twice.
        CONSTRAINT runs_job_unique UNIQUE (machine, external_job_id),
        CHECK (ended_at > started_at)
      );
      CREATE INDEX runs_campaign ON runs (campaign_id, started_at);

      CREATE TABLE ledger_entries (
        id bigserial PRIMARY KEY,
        campaign_id uuid NOT NULL REFERENCES campaigns(id) ON DELETE RESTRICT,
        kind text NOT NULL CHECK (kind IN ('grant', 'debit', 'refund', 'adjustment', 'transfer', 'expiry')),
        milli bigint NOT NULL,
        run_id uuid REFERENCES runs(id) ON DELETE RESTRICT,
        counterpart_campaign_id uuid REFERENCES campaigns(id) ON DELETE RESTRICT,
        reason text,
        overdraft boolean NOT NULL DEFAULT false,
        actor_person_id uuid REFERENCES people(id) ON DELETE SET NULL,
        created_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT ledger_sign CHECK (
          (kind IN ('grant', 'refund') AND milli > 0) OR (kind IN ('debit', 'expiry') AND milli < 0)
          OR (kind IN ('adjustment', 'transfer') AND milli <> 0)),
        CONSTRAINT ledger_run_kinds CHECK ((kind IN ('debit', 'refund')) = (run_id IS NOT NULL)),
        CONSTRAINT ledger_transfer_counterpart CHECK ((kind = 'transfer') = (counterpart_campaign_id IS NOT NULL)),
        CONSTRAINT ledger_reasons CHECK (kind NOT IN ('adjustment', 'transfer', 'refund') OR reason IS NOT NULL)
      );
      CREATE INDEX ledger_entries_campaign ON ledger_entries (campaign_id, id);
      -- One grant and one expiry per campaign, one debit per run.
      CREATE UNIQUE INDEX ledger_one_grant ON ledger_entries (campaign_id) WHERE kind = 'grant';
      CREATE UNIQUE INDEX ledger_one_expiry ON ledger_entries (campaign_id) WHERE kind = 'expiry';
      CREATE UNIQUE INDEX ledger_one_debit_per_run ON ledger_entries (run_id) WHERE kind = 'debit';
      CREATE FUNCTION ledger_entries_append_only() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN RAISE EXCEPTION 'the core-hour ledger is append-only'; END $$;
      CREATE TRIGGER ledger_entries_no_change BEFORE UPDATE OR DELETE ON ledger_entries
        FOR EACH ROW EXECUTE FUNCTION ledger_entries_append_only();

      CREATE TABLE usage_alerts (
        campaign_id uuid NOT NULL REFERENCES campaigns(id) ON DELETE CASCADE,
        threshold smallint NOT NULL CHECK (threshold IN (75, 90, 100)),
        created_at timestamptz NOT NULL DEFAULT now(),
        PRIMARY KEY (campaign_id, threshold)
      );

      CREATE TABLE idempotency_keys (
        owner text NOT NULL,
        key text NOT NULL,
        request_hash text NOT NULL,
        status integer,
        -- The answer's JSON text as sent: jsonb would reorder its keys, and a replay must be byte for byte.
        response text,
        created_at timestamptz NOT NULL DEFAULT now(),
        PRIMARY KEY (owner, key)
      );
      CREATE INDEX idempotency_keys_created ON idempotency_keys (created_at);

      CREATE TABLE notifications (
        id bigserial PRIMARY KEY,
        person_id uuid NOT NULL REFERENCES people(id) ON DELETE CASCADE,
        kind text NOT NULL,
        title text NOT NULL,
        body text NOT NULL,
        link text,
        dedupe_key text NOT NULL,
        read_at timestamptz,
        created_at timestamptz NOT NULL DEFAULT now(),
        UNIQUE (person_id, dedupe_key)
      );
      CREATE INDEX notifications_unread ON notifications (person_id, id) WHERE read_at IS NULL;
      CREATE INDEX notifications_person ON notifications (person_id, id);
      `,
      { transaction },
    );
  });
};

export const down: Migration['down'] = async ({ sequelize }) => {
  await sequelize.query(`
    DROP TABLE IF EXISTS notifications, idempotency_keys, usage_alerts;
    DROP TRIGGER IF EXISTS ledger_entries_no_change ON ledger_entries;
    DROP TABLE IF EXISTS ledger_entries;
    DROP FUNCTION IF EXISTS ledger_entries_append_only();
    DROP TABLE IF EXISTS runs, reviews, review_assignments;
    ALTER TABLE people DROP COLUMN IF EXISTS mail_preferences;
    ALTER TABLE rounds DROP COLUMN IF EXISTS allocation_ends_at, DROP COLUMN IF EXISTS overdraft_percent, DROP COLUMN IF EXISTS closing_notice_sent_at;
  `);
};
