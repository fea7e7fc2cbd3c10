import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

export type CalibrationResult = 'in_tolerance' | 'out_of_tolerance' | 'adjusted';

/** A measuring instrument. Results name the gauge so an out-of-tolerance calibration can be traced forward. */
export class Gauge extends Model<InferAttributes<Gauge>, InferCreationAttributes<Gauge>> {
  declare id: CreationOptional<number>;
  declare code: string;
  declare description: string;
  declare kind: string;
  declare resolution: number | null;
  declare unit: string | null;
  /** Calendar date as `YYYY-MM-DD`. */
  declare calibrationDueOn: string | null;
  declare status: CreationOptional<string>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Gauge.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        code: { type: DataTypes.STRING(30), allowNull: false, unique: true },
        description: { type: DataTypes.STRING(120), allowNull: false },
        kind: { type: DataTypes.STRING(40), allowNull: false },
        resolution: { type: DataTypes.DECIMAL(12, 6), allowNull: true },
        unit: { type: DataTypes.STRING(20), allowNull: true },
        calibrationDueOn: { type: DataTypes.DATEONLY, allowNull: true },
        status: { type: DataTypes.STRING(20), allowNull: false, defaultValue: 'in_service' },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'gauges', underscored: true },
    );
  }
}

export class GaugeCalibration extends Model<
  InferAttributes<GaugeCalibration>,
  InferCreationAttributes<GaugeCalibration>
> {
  declare id: CreationOptional<number>;
  declare gaugeId: number;
  /** Calendar dates as `YYYY-MM-DD`. */
  declare calibratedOn: string;
  declare dueOn: string;
  declare result: CalibrationResult;
  declare certificate: string | null;
  // `…ById` so the association can be called `recordedBy` without colliding with the column
  declare recordedById: number | null;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    GaugeCalibration.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        gaugeId: { type: DataTypes.INTEGER, allowNull: false },
        calibratedOn: { type: DataTypes.DATEONLY, allowNull: false },
        dueOn: { type: DataTypes.DATEONLY, allowNull: false },
        result: { type: DataTypes.STRING(20), allowNull: false },
        certificate: { type: DataTypes.STRING(60), allowNull: true },
        recordedById: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'gauge_calibrations', underscored: true, updatedAt: false },
    );
  }
}
