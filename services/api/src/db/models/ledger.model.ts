import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { LedgerKind, RunParameters } from '@localis/shared';

/** One job on a machine, charged to a campaign. */
export class Run extends Model<InferAttributes<Run>, InferCreationAttributes<Run>> {
  declare id: CreationOptional<string>;
  declare campaignId: string;
  declare externalJobId: string;
  declare machine: string;
  declare startedAt: Date;
  declare endedAt: Date;
  declare cores: number;
  /** BIGINT: pg returns a string. */
  declare coreHoursMilli: number | string;
  declare codeName: string;
  declare codeVersion: string;
  declare parameters: RunParameters;
  declare source: 'portal' | 'api' | 'import';
  declare recordedByPersonId: string | null;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Run.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        campaignId: { type: DataTypes.UUID, allowNull: false },
        externalJobId: { type: DataTypes.TEXT, allowNull: false },
        machine: { type: DataTypes.TEXT, allowNull: false },
        startedAt: { type: DataTypes.DATE, allowNull: false },
        endedAt: { type: DataTypes.DATE, allowNull: false },
        cores: { type: DataTypes.INTEGER, allowNull: false },
        coreHoursMilli: { type: DataTypes.BIGINT, allowNull: false },
        codeName: { type: DataTypes.TEXT, allowNull: false },
        codeVersion: { type: DataTypes.TEXT, allowNull: false },
        parameters: { type: DataTypes.JSONB, allowNull: false },
        source: { type: DataTypes.TEXT, allowNull: false },
        recordedByPersonId: { type: DataTypes.UUID, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'runs', updatedAt: false },
    );
  }
}

/** An append-only ledger entry (a trigger refuses updates and deletes). */
export class LedgerEntry extends Model<InferAttributes<LedgerEntry>, InferCreationAttributes<LedgerEntry>> {
  declare id: CreationOptional<string>;
  declare campaignId: string;
  declare kind: LedgerKind;
  declare milli: number | string;
  declare runId: string | null;
  declare counterpartCampaignId: string | null;
  declare reason: string | null;
  declare overdraft: CreationOptional<boolean>;
  declare actorPersonId: string | null;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    LedgerEntry.init(
      {
        id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
        campaignId: { type: DataTypes.UUID, allowNull: false },
        kind: { type: DataTypes.TEXT, allowNull: false },
        milli: { type: DataTypes.BIGINT, allowNull: false },
        runId: { type: DataTypes.UUID, allowNull: true },
        counterpartCampaignId: { type: DataTypes.UUID, allowNull: true },
        reason: { type: DataTypes.TEXT, allowNull: true },
        overdraft: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        actorPersonId: { type: DataTypes.UUID, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'ledger_entries', updatedAt: false },
    );
  }
}

/** A usage threshold (75, 90, 100 %) reached by a grant; the primary key makes each alert once. */
export class UsageAlert extends Model<InferAttributes<UsageAlert>, InferCreationAttributes<UsageAlert>> {
  declare campaignId: string;
  declare threshold: number;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    UsageAlert.init(
      {
        campaignId: { type: DataTypes.UUID, primaryKey: true },
        threshold: { type: DataTypes.SMALLINT, primaryKey: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'usage_alerts', updatedAt: false },
    );
  }
}
