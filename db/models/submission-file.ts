import { DataTypes, Model, type Sequelize, type InferAttributes, type InferCreationAttributes, type CreationOptional } from 'sequelize';

// A raw upload, kept exactly as it arrived: its bytes in the file store at raw/<sha256>
// (lib/storage/), or in `content` for a file stored before migration 0012 and not yet moved.
export class SubmissionFile extends Model<InferAttributes<SubmissionFile>, InferCreationAttributes<SubmissionFile>> {
  declare id: CreationOptional<number>;
  declare submissionId: number;
  declare revision: CreationOptional<number>;
  declare originalName: string;
  declare sizeBytes: number;
  declare sha256: string;
  declare content: CreationOptional<Buffer | null>;
  declare mediaType: CreationOptional<string>;
  declare aoiDeg: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    SubmissionFile.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        submissionId: { type: DataTypes.INTEGER, allowNull: false },
        revision: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
        originalName: { type: DataTypes.TEXT, allowNull: false },
        sizeBytes: { type: DataTypes.INTEGER, allowNull: false },
        sha256: { type: DataTypes.TEXT, allowNull: false },
        content: { type: DataTypes.BLOB, allowNull: true },
        mediaType: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'text/plain' },
        aoiDeg: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0 },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'submission_files', modelName: 'submissionFile', underscored: true, updatedAt: false },
    );
  }
}
