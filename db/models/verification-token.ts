import { DataTypes, Model, type Sequelize } from 'sequelize';

// One-time tokens behind e-mail link sign-in (written by the next-auth adapter, hashed by next-auth).
export class VerificationToken extends Model {
  static initModel(sequelize: Sequelize) {
    VerificationToken.init(
      {
        token: { type: DataTypes.TEXT, primaryKey: true },
        identifier: { type: DataTypes.TEXT, allowNull: false },
        expires: { type: DataTypes.DATE, allowNull: false },
      },
      { sequelize, tableName: 'verification_tokens', modelName: 'verificationToken', underscored: true, timestamps: false },
    );
  }
}
