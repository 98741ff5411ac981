import { DataTypes } from 'sequelize';
import type { Migration } from '../src/db/migrator';

const timestamps = {
  created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
  updated_at: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
};

/** Allocation rounds with their pools per machine, campaigns, and each campaign's state history. */
export const up: Migration['up'] = async ({ queryInterface: q, sequelize }) => {
  await sequelize.transaction(async (transaction) => {
    await q.createTable('rounds', {
      id: { type: DataTypes.UUID, primaryKey: true },
      name: { type: DataTypes.TEXT, allowNull: false, unique: true },
      opens_at: { type: DataTypes.DATE, allowNull: false },
      closes_at: { type: DataTypes.DATE, allowNull: false },
      ...timestamps,
    }, { transaction });
    await sequelize.query(`ALTER TABLE rounds ADD CONSTRAINT rounds_dates_check CHECK (closes_at > opens_at)`, { transaction });

    await q.createTable('round_pools', {
      round_id: { type: DataTypes.UUID, primaryKey: true, references: { model: 'rounds', key: 'id' }, onDelete: 'CASCADE' },
      machine: { type: DataTypes.TEXT, primaryKey: true },
      core_hours: { type: DataTypes.BIGINT, allowNull: false },
    }, { transaction });
    await sequelize.query(`ALTER TABLE round_pools ADD CONSTRAINT round_pools_positive CHECK (core_hours > 0)`, { transaction });

    await q.createTable('campaigns', {
      id: { type: DataTypes.UUID, primaryKey: true },
      title: { type: DataTypes.TEXT, allowNull: false },
      abstract: { type: DataTypes.TEXT, allowNull: false },
      justification: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      group_id: { type: DataTypes.UUID, allowNull: false, references: { model: 'research_groups', key: 'id' }, onDelete: 'RESTRICT' },
      round_id: { type: DataTypes.UUID, allowNull: false, references: { model: 'rounds', key: 'id' }, onDelete: 'RESTRICT' },
      machine: { type: DataTypes.TEXT, allowNull: false },
      owner_person_id: { type: DataTypes.UUID, allowNull: false, references: { model: 'people', key: 'id' }, onDelete: 'RESTRICT' },
      state: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'draft' },
      spec: { type: DataTypes.JSONB, allowNull: false },
      estimate: { type: DataTypes.JSONB, allowNull: false },
      notices: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
      // Copied out of the spec and estimate so lists filter and sort on indexed columns.
      method: { type: DataTypes.TEXT, allowNull: false },
      dimension: { type: DataTypes.SMALLINT, allowNull: false },
      symmetry_class: { type: DataTypes.TEXT, allowNull: false },
      requested_core_hours: { type: DataTypes.BIGINT, allowNull: false },
      peak_memory_bytes: { type: DataTypes.DOUBLE, allowNull: false },
      warning_count: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      granted_core_hours: { type: DataTypes.BIGINT, allowNull: true },
      submitted_at: { type: DataTypes.DATE, allowNull: true },
      decided_at: { type: DataTypes.DATE, allowNull: true },
      ...timestamps,
    }, { transaction });
    await sequelize.query(
      `ALTER TABLE campaigns
         ADD CONSTRAINT campaigns_state_check CHECK (state IN ('draft', 'submitted', 'in-review', 'granted', 'partly-granted', 'declined', 'withdrawn')),
         ADD CONSTRAINT campaigns_dimension_check CHECK (dimension BETWEEN 1 AND 3),
         ADD CONSTRAINT campaigns_requested_check CHECK (requested_core_hours >= 0),
         -- A campaign draws on a pool the round really has; a pool in use cannot be removed.
         ADD CONSTRAINT campaigns_pool_fk FOREIGN KEY (round_id, machine) REFERENCES round_pools (round_id, machine) ON UPDATE RESTRICT ON DELETE RESTRICT`,
      { transaction },
    );
    for (const cols of [['group_id'], ['round_id'], ['owner_person_id'], ['state'], ['updated_at']]) await q.addIndex('campaigns', cols, { transaction });

    await q.createTable('campaign_events', {
      id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
      campaign_id: { type: DataTypes.UUID, allowNull: false, references: { model: 'campaigns', key: 'id' }, onDelete: 'CASCADE' },
      from_state: { type: DataTypes.TEXT, allowNull: true },
      to_state: { type: DataTypes.TEXT, allowNull: false },
      actor_person_id: { type: DataTypes.UUID, allowNull: true, references: { model: 'people', key: 'id' }, onDelete: 'SET NULL' },
      note: { type: DataTypes.TEXT, allowNull: true },
      created_at: timestamps.created_at,
    }, { transaction });
    await q.addIndex('campaign_events', ['campaign_id', 'id'], { transaction });
    // A campaign's history is kept as it happened: no edits.
    await sequelize.query(`
      CREATE FUNCTION campaign_events_append_only() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN RAISE EXCEPTION 'campaign history is append-only'; END $$;
      CREATE TRIGGER campaign_events_no_change BEFORE UPDATE OR DELETE ON campaign_events
        FOR EACH ROW EXECUTE FUNCTION campaign_events_append_only();`, { transaction });
  });
};

export const down: Migration['down'] = async ({ queryInterface: q, sequelize }) => {
  await sequelize.query('DROP TRIGGER IF EXISTS campaign_events_no_change ON campaign_events');
  await q.dropTable('campaign_events');
  await sequelize.query('DROP FUNCTION IF EXISTS campaign_events_append_only()');
  await q.dropTable('campaigns');
  await q.dropTable('round_pools');
  await q.dropTable('rounds');
};
