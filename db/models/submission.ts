import { DataTypes, Model, type Sequelize, type InferAttributes, type InferCreationAttributes, type CreationOptional } from 'sequelize';

export const SUBMISSION_STATUSES = ['submitted', 'changes_requested', 'verified', 'rejected'] as const;
export type SubmissionStatus = (typeof SUBMISSION_STATUSES)[number];
export const CHECK_LEVELS = ['info', 'warn', 'error'] as const;
export type CheckLevel = (typeof CHECK_LEVELS)[number];
export type StoredCheck = { code: string; level: CheckLevel; message: string; file?: string };

export class Submission extends Model<InferAttributes<Submission>, InferCreationAttributes<Submission>> {
  declare id: CreationOptional<number>;
  declare contributorId: string;
  declare status: CreationOptional<SubmissionStatus>;
  declare revision: CreationOptional<number>;
  declare label: string;
  declare lines: string[];
  declare metadata: Record<string, unknown>;
  declare checks: CreationOptional<StoredCheck[]>;
  declare checkLevel: CreationOptional<CheckLevel>;
  declare replacesCurveId: CreationOptional<number | null>;
  declare decidedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Submission.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        contributorId: { type: DataTypes.UUID, allowNull: false },
        status: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'submitted' },
        revision: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
        label: { type: DataTypes.TEXT, allowNull: false },
        lines: { type: DataTypes.ARRAY(DataTypes.TEXT), allowNull: false, defaultValue: [] },
        metadata: { type: DataTypes.JSONB, allowNull: false },
        checks: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
        checkLevel: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'info' },
        replacesCurveId: DataTypes.INTEGER,
        decidedAt: DataTypes.DATE,
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'submissions', modelName: 'submission', underscored: true },
    );
  }
}
