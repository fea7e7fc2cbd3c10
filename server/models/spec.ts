import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

export type CharacteristicKind = 'variable' | 'attribute' | 'derived';
export type ToleranceStatus = 'draft' | 'approved' | 'superseded' | 'withdrawn';
export type LimitType = 'nominal' | 'range' | 'min' | 'max' | 'attribute';

import type { Derivation } from '../../shared/domain/evaluate.js';
import type { PositionScheme } from '../../shared/domain/positions.js';
import type { SizeClass } from '../../shared/schemas/spec.js';

/** One thing measured or judged at a stage (main bore diameter, crack found …). */
export class Characteristic extends Model<InferAttributes<Characteristic>, InferCreationAttributes<Characteristic>> {
  declare id: CreationOptional<number>;
  declare stageId: number;
  declare code: string;
  declare name: string;
  declare kind: CharacteristicKind;
  declare unit: string | null;
  declare resolution: number | null;
  /** Where on the part it is taken (each cylinder at three depths …), expanded per family in shared/. */
  declare positions: PositionScheme;
  /** How a derived characteristic is computed; the formulas live in shared/domain/evaluate.ts. */
  declare derivation: Derivation | null;
  declare critical: CreationOptional<boolean>;
  declare sortOrder: CreationOptional<number>;
  /** Outside this range a reading is a typing slip, refused before it is judged. */
  declare physicalMin: number | null;
  declare physicalMax: number | null;
  /** The defect code an NCR raised by this characteristic's failure carries. */
  declare defectCode: string | null;
  declare help: CreationOptional<string>;
  /** Tolerance band ÷ gauge resolution the plant asks for here, when relaxed from 10 (with its reason). */
  declare gaugeRatio: CreationOptional<number | null>;
  declare gaugeRatioReason: CreationOptional<string | null>;
  /** Recorded when the station can (torque on a stand with a dynamometer); not required. */
  declare optional: CreationOptional<boolean>;
  /** Gauge kinds (as the register names them) that can measure it; empty: any suitable gauge. */
  declare gaugeKinds: CreationOptional<string[]>;
  /** The purchased part (a lot kind) whose size must match this characteristic's class at build. */
  declare matesWith: CreationOptional<string | null>;
  /** Retired: no longer asked for; its readings and rules stay. */
  declare retiredAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Characteristic.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        stageId: { type: DataTypes.INTEGER, allowNull: false },
        code: { type: DataTypes.STRING(40), allowNull: false },
        name: { type: DataTypes.STRING(120), allowNull: false },
        kind: { type: DataTypes.STRING(10), allowNull: false },
        unit: { type: DataTypes.STRING(20), allowNull: true },
        resolution: { type: DataTypes.DECIMAL(12, 6), allowNull: true },
        positions: { type: DataTypes.JSONB, allowNull: false },
        derivation: { type: DataTypes.JSONB, allowNull: true },
        critical: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        sortOrder: { type: DataTypes.SMALLINT, allowNull: false, defaultValue: 0 },
        physicalMin: { type: DataTypes.DECIMAL(14, 6), allowNull: true },
        physicalMax: { type: DataTypes.DECIMAL(14, 6), allowNull: true },
        defectCode: { type: DataTypes.STRING(20), allowNull: true },
        help: { type: DataTypes.STRING(300), allowNull: false, defaultValue: '' },
        gaugeRatio: { type: DataTypes.DECIMAL(6, 2), allowNull: true },
        gaugeRatioReason: { type: DataTypes.STRING(500), allowNull: true },
        optional: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        gaugeKinds: { type: DataTypes.ARRAY(DataTypes.STRING(40)), allowNull: false, defaultValue: [] },
        matesWith: { type: DataTypes.STRING(20), allowNull: true },
        retiredAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'characteristics', underscored: true },
    );
  }
}

/**
 * A versioned limit for one characteristic in one engine family. Readings keep the rule id and
 * version they were judged against, so an approved rule is superseded, never edited.
 */
export class ToleranceRule extends Model<InferAttributes<ToleranceRule>, InferCreationAttributes<ToleranceRule>> {
  declare id: CreationOptional<number>;
  declare engineFamilyId: number;
  declare characteristicId: number;
  declare version: number;
  declare status: ToleranceStatus;
  declare limitType: LimitType;
  declare nominal: number | null;
  declare minusTol: number | null;
  declare plusTol: number | null;
  declare lowerLimit: number | null;
  declare upperLimit: number | null;
  declare unit: string | null;
  declare resolution: number | null;
  declare sourceNote: CreationOptional<string>;
  /** Size classes of this version, each with its own nominal and tolerances (fixed once approved). */
  declare sizeClasses: CreationOptional<SizeClass[]>;
  declare effectiveFrom: Date | null;
  declare supersededAt: Date | null;
  // `…ById` because the association aliases (`createdBy`, `approvedBy`) would collide with the column names
  declare createdById: number;
  declare approvedById: number | null;
  declare approvedAt: Date | null;
  declare approvalReason: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    ToleranceRule.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        engineFamilyId: { type: DataTypes.INTEGER, allowNull: false },
        characteristicId: { type: DataTypes.INTEGER, allowNull: false },
        version: { type: DataTypes.INTEGER, allowNull: false },
        status: { type: DataTypes.STRING(12), allowNull: false },
        limitType: { type: DataTypes.STRING(12), allowNull: false },
        nominal: { type: DataTypes.DECIMAL(14, 6), allowNull: true },
        minusTol: { type: DataTypes.DECIMAL(14, 6), allowNull: true },
        plusTol: { type: DataTypes.DECIMAL(14, 6), allowNull: true },
        lowerLimit: { type: DataTypes.DECIMAL(14, 6), allowNull: true },
        upperLimit: { type: DataTypes.DECIMAL(14, 6), allowNull: true },
        unit: { type: DataTypes.STRING(20), allowNull: true },
        resolution: { type: DataTypes.DECIMAL(12, 6), allowNull: true },
        sourceNote: { type: DataTypes.STRING(300), allowNull: false, defaultValue: '' },
        sizeClasses: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
        effectiveFrom: { type: DataTypes.DATE, allowNull: true },
        supersededAt: { type: DataTypes.DATE, allowNull: true },
        createdById: { type: DataTypes.INTEGER, allowNull: false },
        approvedById: { type: DataTypes.INTEGER, allowNull: true },
        approvedAt: { type: DataTypes.DATE, allowNull: true },
        approvalReason: { type: DataTypes.STRING(500), allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'tolerance_rules', underscored: true },
    );
  }
}
