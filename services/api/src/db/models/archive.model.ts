import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { ArchiveFormat, ArchiveKind, ArchiveManifest, ArchiveProblem, ArchiveState } from '@localis/shared';

/** A file in object storage: a result archive or a proposal's attachment. Never deleted. */
export class ArchiveRow extends Model<InferAttributes<ArchiveRow>, InferCreationAttributes<ArchiveRow>> {
  declare id: CreationOptional<string>;
  declare campaignId: string;
  declare kind: ArchiveKind;
  declare fileName: string;
  declare format: ArchiveFormat;
  /** BIGINT: pg returns a string. */
  declare sizeBytes: number | string;
  declare objectKey: string;
  declare uploadId: string | null;
  declare partSizeBytes: number | string;
  declare partCount: number;
  declare declaredSha256: string | null;
  declare state: CreationOptional<ArchiveState>;
  declare problems: CreationOptional<ArchiveProblem[]>;
  declare manifest: ArchiveManifest | null;
  /** Table points kept for the scaling analysis (bounded; see the verification job). */
  declare points: unknown[] | null;
  declare runIds: string[];
  declare uploadedByPersonId: string | null;
  declare checkAttempts: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare receivedAt: Date | null;
  declare checkedAt: Date | null;
  declare withdrawnAt: Date | null;
  declare withdrawnReason: string | null;
  declare withdrawnByPersonId: string | null;

  static initModel(sequelize: Sequelize) {
    ArchiveRow.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        campaignId: { type: DataTypes.UUID, allowNull: false },
        kind: { type: DataTypes.TEXT, allowNull: false },
        fileName: { type: DataTypes.TEXT, allowNull: false },
        format: { type: DataTypes.TEXT, allowNull: false },
        sizeBytes: { type: DataTypes.BIGINT, allowNull: false },
        objectKey: { type: DataTypes.TEXT, allowNull: false },
        uploadId: { type: DataTypes.TEXT, allowNull: true },
        partSizeBytes: { type: DataTypes.BIGINT, allowNull: false },
        partCount: { type: DataTypes.INTEGER, allowNull: false },
        declaredSha256: { type: DataTypes.TEXT, allowNull: true },
        state: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'uploading' },
        problems: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
        manifest: { type: DataTypes.JSONB, allowNull: true },
        points: { type: DataTypes.JSONB, allowNull: true },
        runIds: { type: DataTypes.ARRAY(DataTypes.UUID), allowNull: false, defaultValue: [] },
        uploadedByPersonId: { type: DataTypes.UUID, allowNull: true },
        checkAttempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
        receivedAt: { type: DataTypes.DATE, allowNull: true },
        checkedAt: { type: DataTypes.DATE, allowNull: true },
        withdrawnAt: { type: DataTypes.DATE, allowNull: true },
        withdrawnReason: { type: DataTypes.TEXT, allowNull: true },
        withdrawnByPersonId: { type: DataTypes.UUID, allowNull: true },
      },
      { sequelize, tableName: 'archives' },
    );
  }
}

/** One leaf of the provenance log (append-only; the sequencer sets leafIndex once). */
export class ProvenanceEntryRow extends Model<InferAttributes<ProvenanceEntryRow>, InferCreationAttributes<ProvenanceEntryRow>> {
  declare id: CreationOptional<string>;
  declare leafIndex: number | string | null;
  declare kind: string;
  declare campaignId: string;
  declare subjectId: string;
  declare content: string;
  declare leafHash: Buffer;
  declare createdAt: CreationOptional<Date>;
  declare sequencedAt: Date | null;

  static initModel(sequelize: Sequelize) {
    ProvenanceEntryRow.init(
      {
        id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
        leafIndex: { type: DataTypes.BIGINT, allowNull: true },
        kind: { type: DataTypes.TEXT, allowNull: false },
        campaignId: { type: DataTypes.UUID, allowNull: false },
        subjectId: { type: DataTypes.TEXT, allowNull: false },
        content: { type: DataTypes.TEXT, allowNull: false },
        leafHash: { type: DataTypes.BLOB, allowNull: false },
        createdAt: DataTypes.DATE,
        sequencedAt: { type: DataTypes.DATE, allowNull: true },
      },
      { sequelize, tableName: 'provenance_entries', updatedAt: false },
    );
  }
}

/** A tree head the server signed. */
export class ProvenanceTreeHeadRow extends Model<InferAttributes<ProvenanceTreeHeadRow>, InferCreationAttributes<ProvenanceTreeHeadRow>> {
  declare treeSize: number | string;
  declare rootHash: Buffer;
  declare signedAt: Date;
  declare keyId: string;
  declare signature: string;

  static initModel(sequelize: Sequelize) {
    ProvenanceTreeHeadRow.init(
      {
        treeSize: { type: DataTypes.BIGINT, primaryKey: true },
        rootHash: { type: DataTypes.BLOB, allowNull: false },
        signedAt: { type: DataTypes.DATE, allowNull: false },
        keyId: { type: DataTypes.TEXT, allowNull: false },
        signature: { type: DataTypes.TEXT, allowNull: false },
      },
      { sequelize, tableName: 'provenance_tree_heads', timestamps: false },
    );
  }
}

/** A scaling analysis of a campaign's verified archives. */
export class AnalysisRow extends Model<InferAttributes<AnalysisRow>, InferCreationAttributes<AnalysisRow>> {
  declare id: CreationOptional<string>;
  declare campaignId: string;
  declare state: CreationOptional<'queued' | 'running' | 'done' | 'failed'>;
  declare request: Record<string, unknown>;
  declare progress: { done: number; total: number } | null;
  declare archiveIds: string[];
  declare points: CreationOptional<number>;
  declare result: Record<string, unknown> | null;
  declare error: string | null;
  declare requestedByPersonId: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare startedAt: Date | null;
  declare finishedAt: Date | null;

  static initModel(sequelize: Sequelize) {
    AnalysisRow.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        campaignId: { type: DataTypes.UUID, allowNull: false },
        state: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'queued' },
        request: { type: DataTypes.JSONB, allowNull: false },
        progress: { type: DataTypes.JSONB, allowNull: true },
        archiveIds: { type: DataTypes.ARRAY(DataTypes.UUID), allowNull: false, defaultValue: [] },
        points: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        result: { type: DataTypes.JSONB, allowNull: true },
        error: { type: DataTypes.TEXT, allowNull: true },
        requestedByPersonId: { type: DataTypes.UUID, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
        startedAt: { type: DataTypes.DATE, allowNull: true },
        finishedAt: { type: DataTypes.DATE, allowNull: true },
      },
      { sequelize, tableName: 'analyses' },
    );
  }
}
