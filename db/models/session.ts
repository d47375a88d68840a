import { DataTypes, Model, type Sequelize } from 'sequelize';

// Kept for the next-auth adapter; sign-in itself uses signed JWT sessions.
export class Session extends Model {
  static initModel(sequelize: Sequelize) {
    Session.init(
      {
        id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
        sessionToken: { type: DataTypes.TEXT, allowNull: false, unique: true },
        userId: { type: DataTypes.UUID, allowNull: false },
        expires: { type: DataTypes.DATE, allowNull: false },
      },
      { sequelize, tableName: 'sessions', modelName: 'session', underscored: true, timestamps: false },
    );
  }
}
