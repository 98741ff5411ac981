import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';

export class Round extends Model<InferAttributes<Round>, InferCreationAttributes<Round>> {
  declare id: CreationOptional<string>;
  declare name: string;
  declare opensAt: Date;
  declare closesAt: Date;
  declare allocationEndsAt: Date;
  declare overdraftPercent: CreationOptional<number>;
  /** When the "closes in 14 days" notice went out (cleared when the closing date moves). */
  declare closingNoticeSentAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare pools?: NonAttribute<RoundPool[]>;

  static initModel(sequelize: Sequelize) {
    Round.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        name: { type: DataTypes.TEXT, allowNull: false },
        opensAt: { type: DataTypes.DATE, allowNull: false },
        closesAt: { type: DataTypes.DATE, allowNull: false },
        allocationEndsAt: { type: DataTypes.DATE, allowNull: false },
        overdraftPercent: { type: DataTypes.SMALLINT, allowNull: false, defaultValue: 0 },
        closingNoticeSentAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'rounds' },
    );
  }
}

export class RoundPool extends Model<InferAttributes<RoundPool>, InferCreationAttributes<RoundPool>> {
  declare roundId: string;
  declare machine: string;
  /** BIGINT comes back from pg as a string; the repository turns it into a number. */
  declare coreHours: number | string;

  static initModel(sequelize: Sequelize) {
    RoundPool.init(
      {
        roundId: { type: DataTypes.UUID, primaryKey: true },
        machine: { type: DataTypes.TEXT, primaryKey: true },
        coreHours: { type: DataTypes.BIGINT, allowNull: false },
      },
      { sequelize, tableName: 'round_pools', timestamps: false },
    );
  }
}
