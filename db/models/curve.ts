import { DataTypes, Model, type Sequelize, type InferAttributes, type InferCreationAttributes, type CreationOptional } from 'sequelize';

export const CURVE_STATUSES = ['submitted', 'changes_requested', 'verified', 'rejected', 'superseded'] as const;
export type CurveStatus = (typeof CURVE_STATUSES)[number];

// Points live in two float8[] columns: one row per curve keeps a 200 000-point curve a single read.
export class Curve extends Model<InferAttributes<Curve>, InferCreationAttributes<Curve>> {
  declare id: CreationOptional<number>;
  declare submissionId: number | null;
  declare fileId: number | null;
  declare contributorId: string;
  declare status: CurveStatus;
  declare setKey: string | null;
  declare revision: CreationOptional<number>;
  declare replacesCurveId: CreationOptional<number | null>;
  declare label: string;
  declare maker: string | null;
  declare lines: string[];
  declare nominalCwlNm: number | null;
  declare nominalFwhmNm: number | null;
  declare declaredPreShiftNm: number | null;
  declare serial: string | null;
  declare sizeMm: string | null;
  declare notes: string | null;
  declare licence: string;
  declare method: Record<string, unknown>;
  declare instrument: string;
  declare aoiDeg: number;
  declare lab: string | null;
  declare measuredOn: string | null;
  declare wavelengthNm: number[];
  declare transmission: number[];
  declare pointCount: number;
  declare pointsHash: string;
  declare peakT: number;
  declare cwlNm: number | null;
  declare fwhmNm: number | null;
  declare meanInBandT: number | null;
  declare effectiveBandwidthNm: number | null;
  declare blockingOd: number | null;
  declare lineTransmission: Record<string, number>;
  declare nEff: number | null;
  /** s and p effective indices of a set measured in polarised light (migration 0011); both or neither. */
  declare nEffS: CreationOptional<number | null>;
  declare nEffP: CreationOptional<number | null>;
  /** dCWL/dT fitted from the unit measured at several temperatures (migration 0006). */
  declare tempCoeffNmPerC: CreationOptional<number | null>;
  declare verifiedAt: Date | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    this.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        submissionId: DataTypes.INTEGER,
        fileId: DataTypes.INTEGER,
        contributorId: { type: DataTypes.UUID, allowNull: false },
        status: { type: DataTypes.TEXT, allowNull: false },
        setKey: DataTypes.TEXT,
        revision: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
        replacesCurveId: DataTypes.INTEGER,
        label: { type: DataTypes.TEXT, allowNull: false },
        maker: DataTypes.TEXT,
        lines: { type: DataTypes.ARRAY(DataTypes.TEXT), allowNull: false, defaultValue: [] },
        nominalCwlNm: DataTypes.DOUBLE,
        nominalFwhmNm: DataTypes.DOUBLE,
        declaredPreShiftNm: DataTypes.DOUBLE,
        serial: DataTypes.TEXT,
        sizeMm: DataTypes.TEXT,
        notes: DataTypes.TEXT,
        licence: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'CC-BY-4.0' },
        method: { type: DataTypes.JSONB, allowNull: false },
        instrument: { type: DataTypes.TEXT, allowNull: false },
        aoiDeg: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0 },
        lab: DataTypes.TEXT,
        measuredOn: DataTypes.DATEONLY,
        wavelengthNm: { type: DataTypes.ARRAY(DataTypes.DOUBLE), allowNull: false },
        transmission: { type: DataTypes.ARRAY(DataTypes.DOUBLE), allowNull: false },
        pointCount: { type: DataTypes.INTEGER, allowNull: false },
        pointsHash: { type: DataTypes.TEXT, allowNull: false },
        peakT: { type: DataTypes.DOUBLE, allowNull: false },
        cwlNm: DataTypes.DOUBLE,
        fwhmNm: DataTypes.DOUBLE,
        meanInBandT: DataTypes.DOUBLE,
        effectiveBandwidthNm: DataTypes.DOUBLE,
        blockingOd: DataTypes.DOUBLE,
        lineTransmission: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
        nEff: DataTypes.DOUBLE,
        nEffS: { type: DataTypes.DOUBLE, field: 'n_eff_s' },
        nEffP: { type: DataTypes.DOUBLE, field: 'n_eff_p' },
        tempCoeffNmPerC: { type: DataTypes.DOUBLE, field: 'temp_coeff_nm_per_c' },
        verifiedAt: DataTypes.DATE,
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      {
        sequelize,
        tableName: 'curves',
        modelName: 'curve',
        underscored: true,
        // The point arrays are large: list views must ask for them explicitly.
        defaultScope: { attributes: { exclude: ['wavelengthNm', 'transmission'] } },
        scopes: { withPoints: { attributes: { include: ['wavelengthNm', 'transmission'] } } },
      },
    );
  }
}
