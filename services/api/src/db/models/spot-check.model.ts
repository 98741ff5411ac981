import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { SpotCheckRow as SpotCheckRowDto, SpotCheckState } from '@localis/shared';
import type { ArchiveRow } from './archive.model';

/** A reproducibility spot-check of one verified result archive. */
export class SpotCheckRecord extends Model<InferAttributes<SpotCheckRecord>, InferCreationAttributes<SpotCheckRecord>> {
  declare id: CreationOptional<string>;
  declare archiveId: string;
  declare campaignId: string;
  declare state: CreationOptional<SpotCheckState>;
  declare progress: { done: number; total: number } | null;
  declare rows: CreationOptional<SpotCheckRowDto[]>;
  declare flagged: CreationOptional<number>;
  declare reason: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare startedAt: Date | null;
  declare finishedAt: Date | null;
  declare archive?: ArchiveRow;

  static initModel(sequelize: Sequelize) {
    SpotCheckRecord.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        archiveId: { type: DataTypes.UUID, allowNull: false },
        campaignId: { type: DataTypes.UUID, allowNull: false },
        state: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'queued' },
        progress: { type: DataTypes.JSONB, allowNull: true },
        rows: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
        flagged: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        reason: { type: DataTypes.TEXT, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
        startedAt: { type: DataTypes.DATE, allowNull: true },
        finishedAt: { type: DataTypes.DATE, allowNull: true },
      },
      { sequelize, tableName: 'spot_checks' },
    );
  }
}
