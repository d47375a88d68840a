import { DataTypes, Model, type Sequelize, type InferAttributes, type InferCreationAttributes, type CreationOptional } from 'sequelize';

export const ROLES = ['contributor', 'moderator', 'admin'] as const;
export type Role = (typeof ROLES)[number];

export class User extends Model<InferAttributes<User>, InferCreationAttributes<User>> {
  declare id: CreationOptional<string>;
  declare name: string | null;
  declare email: string;
  declare emailVerified: Date | null;
  declare image: CreationOptional<string | null>;
  declare passwordHash: string | null;
  declare role: CreationOptional<Role>;
  declare disabledAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    this.init(
      {
        id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
        name: DataTypes.TEXT,
        email: { type: DataTypes.TEXT, allowNull: false, unique: true },
        emailVerified: DataTypes.DATE,
        image: DataTypes.TEXT,
        passwordHash: DataTypes.TEXT,
        role: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'contributor' },
        disabledAt: DataTypes.DATE,
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'users', modelName: 'user', underscored: true },
    );
  }
}
