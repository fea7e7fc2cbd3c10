import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

export type CalibrationResult = 'in_tolerance' | 'out_of_tolerance' | 'adjusted';
export type GaugeStatus = 'in_use' | 'out_for_calibration' | 'out_of_tolerance' | 'retired';
export type StudyVerdict = 'acceptable' | 'conditional' | 'unacceptable';
export type CalibrationPoint = { reference: number; asFound: number; asLeft: number; tolerance: number };

/** A measuring instrument. Results name the gauge so an out-of-tolerance calibration can be traced forward. */
export class Gauge extends Model<InferAttributes<Gauge>, InferCreationAttributes<Gauge>> {
  declare id: CreationOptional<number>;
  declare code: string;
  declare description: string;
  declare kind: string;
  declare serial: CreationOptional<string>;
  declare resolution: number | null;
  declare unit: string | null;
  /** What it can read, in its own unit. */
  declare rangeLow: number | null;
  declare rangeHigh: number | null;
  declare location: CreationOptional<string>;
  declare owner: CreationOptional<string>;
  declare intervalDays: number | null;
  /** Calendar dates as `YYYY-MM-DD`, from the last calibration record. */
  declare calibrationDueOn: string | null;
  declare lastCalibratedOn: CreationOptional<string | null>;
  /** Whether a calibration record left it in tolerance: without one it takes no judged reading. */
  declare calibrated: CreationOptional<boolean>;
  declare studyVerdict: CreationOptional<StudyVerdict | null>;
  declare status: CreationOptional<GaugeStatus>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Gauge.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        code: { type: DataTypes.STRING(30), allowNull: false, unique: true },
        description: { type: DataTypes.STRING(120), allowNull: false },
        kind: { type: DataTypes.STRING(40), allowNull: false },
        serial: { type: DataTypes.STRING(60), allowNull: false, defaultValue: '' },
        resolution: { type: DataTypes.DECIMAL(12, 6), allowNull: true },
        unit: { type: DataTypes.STRING(20), allowNull: true },
        rangeLow: { type: DataTypes.DECIMAL(14, 6), allowNull: true },
        rangeHigh: { type: DataTypes.DECIMAL(14, 6), allowNull: true },
        location: { type: DataTypes.STRING(80), allowNull: false, defaultValue: '' },
        owner: { type: DataTypes.STRING(80), allowNull: false, defaultValue: '' },
        intervalDays: { type: DataTypes.INTEGER, allowNull: true },
        calibrationDueOn: { type: DataTypes.DATEONLY, allowNull: true },
        lastCalibratedOn: { type: DataTypes.DATEONLY, allowNull: true },
        calibrated: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        studyVerdict: { type: DataTypes.STRING(14), allowNull: true },
        status: { type: DataTypes.STRING(20), allowNull: false, defaultValue: 'in_use' },
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
  /** The certificate's number. */
  declare certificate: string | null;
  declare asFoundInTolerance: boolean;
  declare asLeftInTolerance: boolean;
  /** The largest |as found − reference| over the points, in the gauge's unit. */
  declare asFoundError: number;
  declare points: CalibrationPoint[];
  declare performedBy: 'in_house' | 'lab';
  declare performer: string;
  declare certificateAttachmentId: number | null;
  declare notes: string;
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
        asFoundInTolerance: { type: DataTypes.BOOLEAN, allowNull: false },
        asLeftInTolerance: { type: DataTypes.BOOLEAN, allowNull: false },
        asFoundError: { type: DataTypes.DECIMAL(14, 6), allowNull: false },
        points: { type: DataTypes.JSONB, allowNull: false },
        performedBy: { type: DataTypes.STRING(10), allowNull: false },
        performer: { type: DataTypes.STRING(120), allowNull: false },
        certificateAttachmentId: { type: DataTypes.INTEGER, allowNull: true },
        notes: { type: DataTypes.STRING(500), allowNull: false },
        recordedById: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'gauge_calibrations', underscored: true, updatedAt: false },
    );
  }
}

/** A gauge R&R or attribute agreement study: the grid as entered and what it gave. */
export class GaugeStudy extends Model<InferAttributes<GaugeStudy>, InferCreationAttributes<GaugeStudy>> {
  declare id: CreationOptional<number>;
  declare gaugeId: number;
  declare method: 'range' | 'anova' | 'attribute';
  declare characteristic: string;
  declare tolerance: number | null;
  declare data: unknown;
  declare result: unknown;
  declare verdict: StudyVerdict;
  declare recordedById: number;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    GaugeStudy.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        gaugeId: { type: DataTypes.INTEGER, allowNull: false },
        method: { type: DataTypes.STRING(10), allowNull: false },
        characteristic: { type: DataTypes.STRING(120), allowNull: false },
        tolerance: { type: DataTypes.DECIMAL(14, 6), allowNull: true },
        data: { type: DataTypes.JSONB, allowNull: false },
        result: { type: DataTypes.JSONB, allowNull: false },
        verdict: { type: DataTypes.STRING(14), allowNull: false },
        recordedById: { type: DataTypes.INTEGER, allowNull: false },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'gauge_studies', underscored: true, updatedAt: false },
    );
  }
}

/** One signed step that held what a trigger touched in the plant and opened field actions for the rest. */
export class Containment extends Model<InferAttributes<Containment>, InferCreationAttributes<Containment>> {
  declare id: CreationOptional<number>;
  declare number: string;
  declare triggerKind: 'gauge' | 'lot' | 'rule' | 'operator' | 'station' | 'window';
  declare trigger: unknown;
  declare reason: string;
  declare defectCode: string;
  declare notices: CreationOptional<number>;
  declare createdById: number;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Containment.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        number: { type: DataTypes.STRING(20), allowNull: false, unique: true },
        triggerKind: { type: DataTypes.STRING(12), allowNull: false },
        trigger: { type: DataTypes.JSONB, allowNull: false },
        reason: { type: DataTypes.STRING(500), allowNull: false },
        defectCode: { type: DataTypes.STRING(20), allowNull: false },
        notices: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdById: { type: DataTypes.INTEGER, allowNull: false },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'containments', underscored: true, updatedAt: false },
    );
  }
}

export class ContainmentItem extends Model<InferAttributes<ContainmentItem>, InferCreationAttributes<ContainmentItem>> {
  declare id: CreationOptional<number>;
  declare containmentId: number;
  declare itemId: number;
  declare nonconformanceId: number | null;
  declare outcome: 'held' | 'already_held' | 'field_action' | 'scrapped';

  static initModel(sequelize: Sequelize) {
    ContainmentItem.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        containmentId: { type: DataTypes.INTEGER, allowNull: false },
        itemId: { type: DataTypes.INTEGER, allowNull: false },
        nonconformanceId: { type: DataTypes.INTEGER, allowNull: true },
        outcome: { type: DataTypes.STRING(14), allowNull: false },
      },
      { sequelize, tableName: 'containment_items', underscored: true, timestamps: false },
    );
  }
}
