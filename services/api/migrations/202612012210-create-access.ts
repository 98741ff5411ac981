import { DataTypes } from 'sequelize';
import type { Migration } from '../src/db/migrator';

/** Personal API tokens (hash only), server-side sessions, the audit log. */
export const up: Migration['up'] = async ({ queryInterface: q, sequelize }) => {
  await sequelize.transaction(async (transaction) => {
    await q.createTable('api_tokens', {
      id: { type: DataTypes.UUID, primaryKey: true },
      person_id: { type: DataTypes.UUID, allowNull: false, references: { model: 'people', key: 'id' }, onDelete: 'CASCADE' },
      name: { type: DataTypes.TEXT, allowNull: false },
      token_hash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
      prefix: { type: DataTypes.TEXT, allowNull: false },
      scopes: { type: DataTypes.ARRAY(DataTypes.TEXT), allowNull: false },
      expires_at: { type: DataTypes.DATE, allowNull: false },
      last_used_at: { type: DataTypes.DATE, allowNull: true },
      revoked_at: { type: DataTypes.DATE, allowNull: true },
      created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
    }, { transaction });
    await q.addIndex('api_tokens', ['person_id'], { transaction });

    // The layout connect-pg-simple reads and writes.
    await q.createTable('sessions', {
      sid: { type: DataTypes.STRING, primaryKey: true },
      sess: { type: DataTypes.JSON, allowNull: false },
      expire: { type: DataTypes.DATE(6), allowNull: false },
    }, { transaction });
    await q.addIndex('sessions', ['expire'], { transaction });

    await q.createTable('audit_log', {
      id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
      actor_person_id: { type: DataTypes.UUID, allowNull: true, references: { model: 'people', key: 'id' }, onDelete: 'SET NULL' },
      via: { type: DataTypes.TEXT, allowNull: false },
      action: { type: DataTypes.TEXT, allowNull: false },
      target_type: { type: DataTypes.TEXT, allowNull: false },
      target_id: { type: DataTypes.TEXT, allowNull: true },
      details: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
      ip: { type: DataTypes.TEXT, allowNull: true },
      user_agent: { type: DataTypes.TEXT, allowNull: true },
      created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
    }, { transaction });
    await q.addIndex('audit_log', ['created_at'], { transaction });
    await q.addIndex('audit_log', ['target_type', 'target_id'], { transaction });
    // The audit log is append-only: the database itself refuses edits and deletions.
    await sequelize.query(`
      CREATE FUNCTION audit_log_append_only() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN RAISE EXCEPTION 'the audit log is append-only'; END $$;
      CREATE TRIGGER audit_log_no_change BEFORE UPDATE OR DELETE ON audit_log
        FOR EACH ROW EXECUTE FUNCTION audit_log_append_only();`, { transaction });

    await q.createTable('outbox', {
      id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
      kind: { type: DataTypes.TEXT, allowNull: false },
      payload: { type: DataTypes.JSONB, allowNull: false },
      dispatched_at: { type: DataTypes.DATE, allowNull: true },
      attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      last_error: { type: DataTypes.TEXT, allowNull: true },
      created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
    }, { transaction });
    await sequelize.query(`CREATE INDEX outbox_pending ON outbox (id) WHERE dispatched_at IS NULL`, { transaction });
  });
};

export const down: Migration['down'] = async ({ queryInterface: q, sequelize }) => {
  await q.dropTable('outbox');
  await q.dropTable('audit_log');
  await sequelize.query('DROP FUNCTION IF EXISTS audit_log_append_only()');
  await q.dropTable('sessions');
  await q.dropTable('api_tokens');
};
