import { DataTypes } from 'sequelize';
import type { Migration } from '../src/db/migrator';

const timestamps = {
  created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
  updated_at: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
};

/** Institutions, people, research groups and their members, role grants. */
export const up: Migration['up'] = async ({ queryInterface: q, sequelize }) => {
  await sequelize.transaction(async (transaction) => {
    await q.createTable('institutions', {
      id: { type: DataTypes.UUID, primaryKey: true },
      name: { type: DataTypes.TEXT, allowNull: false, unique: true },
      kind: { type: DataTypes.TEXT, allowNull: false },
      country: { type: DataTypes.CHAR(2), allowNull: false },
      billing_email: { type: DataTypes.TEXT, allowNull: true },
      ...timestamps,
    }, { transaction });
    await sequelize.query(`ALTER TABLE institutions ADD CONSTRAINT institutions_kind_check CHECK (kind IN ('member', 'partner'))`, { transaction });

    await q.createTable('people', {
      id: { type: DataTypes.UUID, primaryKey: true },
      oidc_subject: { type: DataTypes.TEXT, allowNull: true, unique: true },
      email: { type: DataTypes.TEXT, allowNull: false, unique: true },
      name: { type: DataTypes.TEXT, allowNull: false },
      institution_id: { type: DataTypes.UUID, allowNull: true, references: { model: 'institutions', key: 'id' }, onDelete: 'RESTRICT' },
      active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
      last_sign_in_at: { type: DataTypes.DATE, allowNull: true },
      ...timestamps,
    }, { transaction });
    await sequelize.query(`ALTER TABLE people ADD CONSTRAINT people_email_lower CHECK (email = lower(email))`, { transaction });
    await q.addIndex('people', ['institution_id'], { transaction });

    await q.createTable('research_groups', {
      id: { type: DataTypes.UUID, primaryKey: true },
      name: { type: DataTypes.TEXT, allowNull: false },
      institution_id: { type: DataTypes.UUID, allowNull: false, references: { model: 'institutions', key: 'id' }, onDelete: 'RESTRICT' },
      pi_person_id: { type: DataTypes.UUID, allowNull: false, references: { model: 'people', key: 'id' }, onDelete: 'RESTRICT' },
      ...timestamps,
    }, { transaction });
    await q.addIndex('research_groups', ['institution_id', 'name'], { unique: true, transaction });

    await q.createTable('group_memberships', {
      group_id: { type: DataTypes.UUID, primaryKey: true, references: { model: 'research_groups', key: 'id' }, onDelete: 'CASCADE' },
      person_id: { type: DataTypes.UUID, primaryKey: true, references: { model: 'people', key: 'id' }, onDelete: 'CASCADE' },
      created_at: timestamps.created_at,
    }, { transaction });
    await q.addIndex('group_memberships', ['person_id'], { transaction });

    await q.createTable('role_grants', {
      id: { type: DataTypes.UUID, primaryKey: true },
      person_id: { type: DataTypes.UUID, allowNull: false, references: { model: 'people', key: 'id' }, onDelete: 'CASCADE' },
      role: { type: DataTypes.TEXT, allowNull: false },
      granted_by_person_id: { type: DataTypes.UUID, allowNull: true, references: { model: 'people', key: 'id' }, onDelete: 'SET NULL' },
      created_at: timestamps.created_at,
    }, { transaction });
    await q.addIndex('role_grants', ['person_id', 'role'], { unique: true, transaction });
    await sequelize.query(
      `ALTER TABLE role_grants ADD CONSTRAINT role_grants_role_check CHECK (role IN ('researcher', 'pi', 'committee', 'admin', 'billing'))`,
      { transaction },
    );
  });
};

export const down: Migration['down'] = async ({ queryInterface: q }) => {
  for (const t of ['role_grants', 'group_memberships', 'research_groups', 'people', 'institutions']) await q.dropTable(t);
};
