import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { AssignmentState } from '@localis/shared';
import type { Person } from './person.model';

/** A committee member asked to review one proposal (or who declared a conflict of interest). */
export class ReviewAssignment extends Model<InferAttributes<ReviewAssignment>, InferCreationAttributes<ReviewAssignment>> {
  declare id: CreationOptional<string>;
  declare campaignId: string;
  declare reviewerPersonId: string;
  declare state: CreationOptional<AssignmentState>;
  declare conflictReason: CreationOptional<string | null>;
  declare assignedByPersonId: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare reviewer?: NonAttribute<Person>;
  declare review?: NonAttribute<Review | null>;

  static initModel(sequelize: Sequelize) {
    ReviewAssignment.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        campaignId: { type: DataTypes.UUID, allowNull: false },
        reviewerPersonId: { type: DataTypes.UUID, allowNull: false },
        state: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'assigned' },
        conflictReason: { type: DataTypes.TEXT, allowNull: true },
        assignedByPersonId: { type: DataTypes.UUID, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'review_assignments' },
    );
  }
}

export class Review extends Model<InferAttributes<Review>, InferCreationAttributes<Review>> {
  declare assignmentId: string;
  declare merit: number;
  declare feasibility: number;
  declare costJustification: number;
  declare toProposers: string;
  declare confidential: string;
  declare recommendedCoreHours: number | string;
  declare submittedAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Review.init(
      {
        assignmentId: { type: DataTypes.UUID, primaryKey: true },
        merit: { type: DataTypes.SMALLINT, allowNull: false },
        feasibility: { type: DataTypes.SMALLINT, allowNull: false },
        costJustification: { type: DataTypes.SMALLINT, allowNull: false },
        toProposers: { type: DataTypes.TEXT, allowNull: false },
        confidential: { type: DataTypes.TEXT, allowNull: false },
        recommendedCoreHours: { type: DataTypes.BIGINT, allowNull: false },
        submittedAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'reviews', createdAt: 'submittedAt' },
    );
  }
}
