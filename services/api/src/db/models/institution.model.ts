import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { InstitutionKind } from '@localis/shared';

export class Institution extends Model<InferAttributes<Institution>, InferCreationAttributes<Institution>> {
  declare id: CreationOptional<string>;
  declare name: string;
  declare kind: InstitutionKind;
  declare country: string;
  declare billingEmail: string | null;
  /** The partner's customer at Stripe, made when its first invoice is issued. */
  declare stripeCustomerId: CreationOptional<string | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Institution.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        name: { type: DataTypes.TEXT, allowNull: false },
        kind: { type: DataTypes.TEXT, allowNull: false },
        country: { type: DataTypes.CHAR(2), allowNull: false },
        billingEmail: { type: DataTypes.TEXT, allowNull: true },
        stripeCustomerId: { type: DataTypes.TEXT, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'institutions' },
    );
  }
}
