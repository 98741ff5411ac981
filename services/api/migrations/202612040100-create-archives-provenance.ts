import type { Migration } from '../src/db/migrator';

/**
 * Result archives in object storage and the tamper-evident provenance log.
 * Archives are never deleted (only withdrawn, with a reason); log entries are never changed once
 * written, except that the sequencer gives each its leaf index once (a trigger enforces both).
 */
export const up: Migration['up'] = async ({ sequelize }) => {
  await sequelize.transaction(async (transaction) => {
    await sequelize.query(
      `
      CREATE TABLE archives (
        id uuid PRIMARY KEY,
        campaign_id uuid NOT NULL REFERENCES campaigns(id) ON DELETE RESTRICT,
        kind text NOT NULL CHECK (kind IN ('results', 'science-case', 'pilot-timings')),
        file_name text NOT NULL,
        format text NOT NULL CHECK (format IN ('tar.gz', 'tar', 'zip', 'pdf', 'csv')),
        size_bytes bigint NOT NULL CHECK (size_bytes > 0),
        object_key text NOT NULL UNIQUE,
        upload_id text,
        part_size_bytes bigint NOT NULL CHECK (part_size_bytes > 0),
        part_count integer NOT NULL CHECK (part_count BETWEEN 1 AND 10000),
        declared_sha256 text CHECK (declared_sha256 ~ '^[0-9a-f]{64}$'),
        state text NOT NULL DEFAULT 'uploading' CHECK (state IN ('uploading', 'received', 'checking', 'verified', 'rejected')),
        problems jsonb NOT NULL DEFAULT '[]'::jsonb,
        manifest jsonb,
        points jsonb,
        run_ids uuid[] NOT NULL DEFAULT '{}',
        uploaded_by_person_id uuid REFERENCES people(id) ON DELETE SET NULL,
        check_attempts integer NOT NULL DEFAULT 0,
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        received_at timestamptz,
        checked_at timestamptz,
        withdrawn_at timestamptz,
        withdrawn_reason text,
        withdrawn_by_person_id uuid REFERENCES people(id) ON DELETE SET NULL,
        -- Uploads declare their SHA-256 when complete; a cancelled or abandoned one never does.
        CHECK (state <> 'uploading' OR declared_sha256 IS NULL),
        CHECK (state IN ('uploading', 'rejected') OR declared_sha256 IS NOT NULL),
        CHECK ((withdrawn_at IS NULL) = (withdrawn_reason IS NULL)),
        CHECK (withdrawn_at IS NULL OR state IN ('verified', 'rejected'))
      );
      CREATE INDEX archives_campaign ON archives (campaign_id, created_at DESC);
      CREATE INDEX archives_sha256 ON archives (declared_sha256) WHERE declared_sha256 IS NOT NULL;
      CREATE INDEX archives_pending ON archives (state) WHERE state IN ('received', 'checking');

      CREATE TABLE provenance_entries (
        id bigserial PRIMARY KEY,
        leaf_index bigint UNIQUE,
        kind text NOT NULL CHECK (kind IN ('run-recorded', 'grant-decided', 'archive-verified', 'archive-withdrawn', 'analysis-computed')),
        campaign_id uuid NOT NULL REFERENCES campaigns(id) ON DELETE RESTRICT,
        subject_id text NOT NULL,
        content text NOT NULL,
        leaf_hash bytea NOT NULL CHECK (length(leaf_hash) = 32),
        created_at timestamptz NOT NULL DEFAULT now(),
        sequenced_at timestamptz,
        UNIQUE (kind, subject_id)
      );
      CREATE INDEX provenance_entries_campaign ON provenance_entries (campaign_id, id);
      CREATE INDEX provenance_entries_unsequenced ON provenance_entries (id) WHERE leaf_index IS NULL;

      CREATE FUNCTION provenance_entries_append_only() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        IF TG_OP = 'UPDATE' AND OLD.leaf_index IS NULL AND NEW.leaf_index IS NOT NULL
           AND NEW.content = OLD.content AND NEW.leaf_hash = OLD.leaf_hash AND NEW.kind = OLD.kind
           AND NEW.campaign_id = OLD.campaign_id AND NEW.subject_id = OLD.subject_id AND NEW.created_at = OLD.created_at THEN
          RETURN NEW;
        END IF;
        RAISE EXCEPTION 'the provenance log is append-only (% refused)', TG_OP;
      END $$;
      CREATE TRIGGER provenance_entries_append_only BEFORE UPDATE OR DELETE ON provenance_entries
        FOR EACH ROW EXECUTE FUNCTION provenance_entries_append_only();
      CREATE TRIGGER provenance_entries_no_truncate BEFORE TRUNCATE ON provenance_entries
        FOR EACH STATEMENT EXECUTE FUNCTION provenance_entries_append_only();

      CREATE TABLE provenance_tree_heads (
        tree_size bigint PRIMARY KEY CHECK (tree_size >= 0),
        root_hash bytea NOT NULL CHECK (length(root_hash) = 32),
        signed_at timestamptz NOT NULL,
        key_id text NOT NULL,
        signature text NOT NULL
      );
      `,
      { transaction },
    );
  });
};

export const down: Migration['down'] = async ({ sequelize }) => {
  await sequelize.transaction(async (transaction) => {
    await sequelize.query(
      `
      DROP TABLE IF EXISTS provenance_tree_heads;
      DROP TABLE IF EXISTS provenance_entries;
      DROP FUNCTION IF EXISTS provenance_entries_append_only();
      DROP TABLE IF EXISTS archives;
      `,
      { transaction },
    );
  });
};
