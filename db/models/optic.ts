import { DataTypes, Model, type Sequelize, type InferAttributes, type InferCreationAttributes, type CreationOptional } from 'sequelize';

export class Optic extends Model<InferAttributes<Optic>, InferCreationAttributes<Optic>> {
  declare id: CreationOptional<number>;
  declare ownerId: string | null;
  declare isExample: CreationOptional<boolean>;
  declare name: string;
  declare description: string | null;
  declare apertureMm: number | null;
  declare focalLengthMm: number | null;
  declare obstructionMm: number | null;
  declare reducerFactor: number | null;
  declare fNumber: number;
  declare obstruction: number;
  declare fieldAngleDeg: number;
  declare sensorDiagonalMm: number | null;
  declare exitPupilDistanceMm: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    this.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        ownerId: DataTypes.UUID,
        isExample: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        name: { type: DataTypes.TEXT, allowNull: false },
        description: DataTypes.TEXT,
        apertureMm: DataTypes.DOUBLE,
        focalLengthMm: DataTypes.DOUBLE,
        obstructionMm: DataTypes.DOUBLE,
        reducerFactor: DataTypes.DOUBLE,
        fNumber: { type: DataTypes.DOUBLE, allowNull: false },
        obstruction: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0 },
        fieldAngleDeg: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0 },
        sensorDiagonalMm: DataTypes.DOUBLE,
        exitPupilDistanceMm: DataTypes.DOUBLE,
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'optics', modelName: 'optic', underscored: true },
    );
  }
}
