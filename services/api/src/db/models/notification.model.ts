import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { NotificationKind } from '@localis/shared';

/** An in-app notification; `dedupeKey` makes each event notify a person once. */
export class Notification extends Model<InferAttributes<Notification>, InferCreationAttributes<Notification>> {
  declare id: CreationOptional<string>;
  declare personId: string;
  declare kind: NotificationKind;
  declare title: string;
  declare body: string;
  declare link: string | null;
  declare dedupeKey: string;
  declare readAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Notification.init(
      {
        id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
        personId: { type: DataTypes.UUID, allowNull: false },
        kind: { type: DataTypes.TEXT, allowNull: false },
        title: { type: DataTypes.TEXT, allowNull: false },
        body: { type: DataTypes.TEXT, allowNull: false },
        link: { type: DataTypes.TEXT, allowNull: true },
        dedupeKey: { type: DataTypes.TEXT, allowNull: false },
        readAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'notifications', updatedAt: false },
    );
  }
}

/** The first answer to a write sent with an Idempotency-Key, replayed for the same key and body. */
export class IdempotencyKey extends Model<InferAttributes<IdempotencyKey>, InferCreationAttributes<IdempotencyKey>> {
  declare owner: string;
  declare key: string;
  declare requestHash: string;
  declare status: number | null;
  /** The JSON text of the first answer, or null for an empty one. */
  declare response: string | null;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    IdempotencyKey.init(
      {
        owner: { type: DataTypes.TEXT, primaryKey: true },
        key: { type: DataTypes.TEXT, primaryKey: true },
        requestHash: { type: DataTypes.TEXT, allowNull: false },
        status: { type: DataTypes.INTEGER, allowNull: true },
        response: { type: DataTypes.TEXT, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'idempotency_keys', updatedAt: false },
    );
  }
}
