import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { Institution } from './institution.model';
import type { RoleGrant } from './role-grant.model';

export class Person extends Model<InferAttributes<Person>, InferCreationAttributes<Person>> {
  declare id: CreationOptional<string>;
  declare oidcSubject: string | null;
  declare email: string;
  declare name: string;
  declare institutionId: string | null;
  declare active: CreationOptional<boolean>;
  declare lastSignInAt: Date | null;
  /** Optional mails a person turned off or on ({ "usage-threshold": false }); missing keys are on. */
  declare mailPreferences: CreationOptional<Record<string, boolean>>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare institution?: NonAttribute<Institution | null>;
  declare roleGrants?: NonAttribute<RoleGrant[]>;

  static initModel(sequelize: Sequelize) {
    Person.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        oidcSubject: { type: DataTypes.TEXT, allowNull: true, unique: true },
        email: { type: DataTypes.TEXT, allowNull: false, unique: true },
        name: { type: DataTypes.TEXT, allowNull: false },
        institutionId: { type: DataTypes.UUID, allowNull: true },
        active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        lastSignInAt: { type: DataTypes.DATE, allowNull: true },
        mailPreferences: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'people' },
    );
  }
}
