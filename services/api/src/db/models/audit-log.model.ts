import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { Person } from './person.model';

export class AuditLog extends Model<InferAttributes<AuditLog>, InferCreationAttributes<AuditLog>> {
  declare id: CreationOptional<string>;
  declare actorPersonId: string | null;
  declare via: 'session' | 'token' | 'system';
  declare action: string;
  declare targetType: string;
  declare targetId: string | null;
  declare details: Record<string, unknown>;
  declare ip: string | null;
  declare userAgent: string | null;
  declare createdAt: CreationOptional<Date>;
  declare actor?: NonAttribute<Person | null>;

  static initModel(sequelize: Sequelize) {
    AuditLog.init(
      {
        id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
        actorPersonId: { type: DataTypes.UUID, allowNull: true },
        via: { type: DataTypes.TEXT, allowNull: false },
        action: { type: DataTypes.TEXT, allowNull: false },
        targetType: { type: DataTypes.TEXT, allowNull: false },
        targetId: { type: DataTypes.TEXT, allowNull: true },
        details: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
        ip: { type: DataTypes.TEXT, allowNull: true },
        userAgent: { type: DataTypes.TEXT, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'audit_log', updatedAt: false },
    );
  }
}
