import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { Institution } from './institution.model';
import type { Person } from './person.model';

export class ResearchGroup extends Model<InferAttributes<ResearchGroup>, InferCreationAttributes<ResearchGroup>> {
  declare id: CreationOptional<string>;
  declare name: string;
  declare institutionId: string;
  declare piPersonId: string;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare institution?: NonAttribute<Institution>;
  declare pi?: NonAttribute<Person>;
  declare memberships?: NonAttribute<GroupMembership[]>;

  static initModel(sequelize: Sequelize) {
    ResearchGroup.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        name: { type: DataTypes.TEXT, allowNull: false },
        institutionId: { type: DataTypes.UUID, allowNull: false },
        piPersonId: { type: DataTypes.UUID, allowNull: false },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'research_groups' },
    );
  }
}

export class GroupMembership extends Model<InferAttributes<GroupMembership>, InferCreationAttributes<GroupMembership>> {
  declare groupId: string;
  declare personId: string;
  declare createdAt: CreationOptional<Date>;
  declare person?: NonAttribute<Person>;
  declare group?: NonAttribute<ResearchGroup>;

  static initModel(sequelize: Sequelize) {
    GroupMembership.init(
      {
        groupId: { type: DataTypes.UUID, primaryKey: true },
        personId: { type: DataTypes.UUID, primaryKey: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'group_memberships', updatedAt: false },
    );
  }
}
