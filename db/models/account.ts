import { DataTypes, Model, type Sequelize } from 'sequelize';

// Linked sign-in providers, in the shape the next-auth adapter expects.
export class Account extends Model {
  static initModel(sequelize: Sequelize) {
    Account.init(
      {
        id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
        userId: { type: DataTypes.UUID, allowNull: false },
        type: { type: DataTypes.TEXT, allowNull: false },
        provider: { type: DataTypes.TEXT, allowNull: false },
        providerAccountId: { type: DataTypes.TEXT, allowNull: false },
        refresh_token: DataTypes.TEXT,
        access_token: DataTypes.TEXT,
        expires_at: DataTypes.INTEGER,
        token_type: DataTypes.TEXT,
        scope: DataTypes.TEXT,
        id_token: DataTypes.TEXT,
        session_state: DataTypes.TEXT,
      },
      { sequelize, tableName: 'accounts', modelName: 'account', underscored: true, timestamps: false },
    );
  }
}
