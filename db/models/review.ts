import { DataTypes, Model, type Sequelize, type InferAttributes, type InferCreationAttributes, type CreationOptional } from 'sequelize';

export const REVIEW_KINDS = ['verify', 'request_changes', 'reject', 'note', 'reply'] as const;
export type ReviewKind = (typeof REVIEW_KINDS)[number];

// Decisions and the notes around them form one thread per submission.
export class Review extends Model<InferAttributes<Review>, InferCreationAttributes<Review>> {
  declare id: CreationOptional<number>;
  declare submissionId: number;
  declare authorId: string;
  declare kind: ReviewKind;
  declare body: string;
  declare isPublic: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    this.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        submissionId: { type: DataTypes.INTEGER, allowNull: false },
        authorId: { type: DataTypes.UUID, allowNull: false },
        kind: { type: DataTypes.TEXT, allowNull: false },
        body: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        isPublic: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'reviews', modelName: 'review', underscored: true, updatedAt: false },
    );
  }
}
