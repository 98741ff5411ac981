import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { CampaignSpec, CampaignState, Notice } from '@localis/shared';
import type { Person } from './person.model';
import type { ResearchGroup } from './research-group.model';
import type { Round } from './round.model';

export class Campaign extends Model<InferAttributes<Campaign>, InferCreationAttributes<Campaign>> {
  declare id: CreationOptional<string>;
  declare title: string;
  declare abstract: string;
  declare justification: string;
  declare groupId: string;
  declare roundId: string;
  declare machine: string;
  declare ownerPersonId: string;
  declare state: CreationOptional<CampaignState>;
  declare spec: CampaignSpec;
  declare estimate: Record<string, unknown>;
  declare notices: Notice[];
  declare method: string;
  declare dimension: number;
  declare symmetryClass: string;
  declare requestedCoreHours: number | string;
  declare peakMemoryBytes: number;
  declare warningCount: number;
  declare grantedCoreHours: CreationOptional<number | string | null>;
  declare submittedAt: CreationOptional<Date | null>;
  declare decidedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare group?: NonAttribute<ResearchGroup>;
  declare round?: NonAttribute<Round>;
  declare owner?: NonAttribute<Person>;

  static initModel(sequelize: Sequelize) {
    Campaign.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        title: { type: DataTypes.TEXT, allowNull: false },
        abstract: { type: DataTypes.TEXT, allowNull: false },
        justification: { type: DataTypes.TEXT, allowNull: false },
        groupId: { type: DataTypes.UUID, allowNull: false },
        roundId: { type: DataTypes.UUID, allowNull: false },
        machine: { type: DataTypes.TEXT, allowNull: false },
        ownerPersonId: { type: DataTypes.UUID, allowNull: false },
        state: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'draft' },
        spec: { type: DataTypes.JSONB, allowNull: false },
        estimate: { type: DataTypes.JSONB, allowNull: false },
        notices: { type: DataTypes.JSONB, allowNull: false },
        method: { type: DataTypes.TEXT, allowNull: false },
        dimension: { type: DataTypes.SMALLINT, allowNull: false },
        symmetryClass: { type: DataTypes.TEXT, allowNull: false },
        requestedCoreHours: { type: DataTypes.BIGINT, allowNull: false },
        peakMemoryBytes: { type: DataTypes.DOUBLE, allowNull: false },
        warningCount: { type: DataTypes.INTEGER, allowNull: false },
        grantedCoreHours: { type: DataTypes.BIGINT, allowNull: true },
        submittedAt: { type: DataTypes.DATE, allowNull: true },
        decidedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'campaigns' },
    );
  }
}

export class CampaignEvent extends Model<InferAttributes<CampaignEvent>, InferCreationAttributes<CampaignEvent>> {
  declare id: CreationOptional<string>;
  declare campaignId: string;
  declare fromState: CampaignState | null;
  declare toState: CampaignState;
  declare actorPersonId: string | null;
  declare note: string | null;
  declare createdAt: CreationOptional<Date>;
  declare actor?: NonAttribute<Person | null>;

  static initModel(sequelize: Sequelize) {
    CampaignEvent.init(
      {
        id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
        campaignId: { type: DataTypes.UUID, allowNull: false },
        fromState: { type: DataTypes.TEXT, allowNull: true },
        toState: { type: DataTypes.TEXT, allowNull: false },
        actorPersonId: { type: DataTypes.UUID, allowNull: true },
        note: { type: DataTypes.TEXT, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'campaign_events', updatedAt: false },
    );
  }
}
