import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { Role } from '@localis/shared';

export class RoleGrant extends Model<InferAttributes<RoleGrant>, InferCreationAttributes<RoleGrant>> {
  declare id: CreationOptional<string>;
  declare personId: string;
  declare role: Role;
  declare grantedByPersonId: string | null;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    RoleGrant.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        personId: { type: DataTypes.UUID, allowNull: false },
        role: { type: DataTypes.TEXT, allowNull: false },
        grantedByPersonId: { type: DataTypes.UUID, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'role_grants', updatedAt: false },
    );
  }
}
