import type { Migration } from '../src/db/migrator';

/** Finite-size scaling analyses of a campaign's verified archives, run by the worker. */
export const up: Migration['up'] = async ({ sequelize }) => {
  await sequelize.transaction(async (transaction) => {
    await sequelize.query(
      `
      CREATE TABLE analyses (
        id uuid PRIMARY KEY,
        campaign_id uuid NOT NULL REFERENCES campaigns(id) ON DELETE RESTRICT,
        state text NOT NULL DEFAULT 'queued' CHECK (state IN ('queued', 'running', 'done', 'failed')),
        request jsonb NOT NULL,
        progress jsonb,
        archive_ids uuid[] NOT NULL DEFAULT '{}',
        points integer NOT NULL DEFAULT 0,
        result jsonb,
        error text,
        requested_by_person_id uuid REFERENCES people(id) ON DELETE SET NULL,
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        started_at timestamptz,
        finished_at timestamptz,
        CHECK ((state = 'done') = (result IS NOT NULL)),
        CHECK ((state = 'failed') = (error IS NOT NULL))
      );
      CREATE INDEX analyses_campaign ON analyses (campaign_id, created_at DESC);
      `,
      { transaction },
    );
  });
};

export const down: Migration['down'] = async ({ sequelize }) => {
  await sequelize.query('DROP TABLE IF EXISTS analyses');
};
