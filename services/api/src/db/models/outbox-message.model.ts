import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** Work that must not be lost, written in the same transaction as the change that causes it. */
export class OutboxMessage extends Model<InferAttributes<OutboxMessage>, InferCreationAttributes<OutboxMessage>> {
  declare id: CreationOptional<string>;
  declare kind: string;
  declare payload: Record<string, unknown>;
  declare dispatchedAt: Date | null;
  declare attempts: CreationOptional<number>;
  declare lastError: string | null;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    OutboxMessage.init(
      {
        id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
        kind: { type: DataTypes.TEXT, allowNull: false },
        payload: { type: DataTypes.JSONB, allowNull: false },
        dispatchedAt: { type: DataTypes.DATE, allowNull: true },
        attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        lastError: { type: DataTypes.TEXT, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'outbox', updatedAt: false },
    );
  }
}
