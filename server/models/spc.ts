import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';
import type { ChartLimits, ChartKind } from '../../shared/domain/spc/index.js';
import type { ChartMethod, RehearsalSummary, RehearsedLimits } from '../../shared/schemas/spc.js';

/**
 * Control limits frozen from a baseline period, for one family × characteristic (× station, or
 * every station when none). Never edited: a new freeze supersedes the one in force.
 */
export class SpcLimits extends Model<InferAttributes<SpcLimits>, InferCreationAttributes<SpcLimits>> {
  declare id: CreationOptional<number>;
  declare engineFamilyId: number;
  declare characteristicId: number;
  declare stationId: number | null;
  declare method: ChartMethod;
  /** The baseline's statistics (shared/domain/spc/limits.ts); the lines follow from them. */
  declare limits: ChartLimits;
  declare baselineFrom: Date;
  declare baselineTo: Date;
  declare baselinePoints: number;
  declare reason: string;
  declare holdOnSignal: boolean;
  declare frozenById: number;
  declare frozenAt: CreationOptional<Date>;
  declare supersededAt: Date | null;
  declare supersededById: number | null;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    SpcLimits.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        engineFamilyId: { type: DataTypes.INTEGER, allowNull: false },
        characteristicId: { type: DataTypes.INTEGER, allowNull: false },
        stationId: { type: DataTypes.INTEGER, allowNull: true },
        method: { type: DataTypes.STRING(12), allowNull: false },
        limits: { type: DataTypes.JSONB, allowNull: false },
        baselineFrom: { type: DataTypes.DATE, allowNull: false },
        baselineTo: { type: DataTypes.DATE, allowNull: false },
        baselinePoints: { type: DataTypes.INTEGER, allowNull: false },
        reason: { type: DataTypes.STRING(500), allowNull: false },
        holdOnSignal: { type: DataTypes.BOOLEAN, allowNull: false },
        frozenById: { type: DataTypes.INTEGER, allowNull: false },
        frozenAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
        supersededAt: { type: DataTypes.DATE, allowNull: true },
        supersededById: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'spc_limits', underscored: true, updatedAt: false },
    );
  }
}

/** A run rule a station result broke against frozen limits, and the hold it led to, if any. */
export class SpcSignal extends Model<InferAttributes<SpcSignal>, InferCreationAttributes<SpcSignal>> {
  declare id: CreationOptional<number>;
  declare spcLimitsId: number;
  declare stageResultId: number;
  declare itemId: number;
  declare chart: ChartKind;
  declare rule: number;
  declare value: number;
  declare centre: number;
  declare lowerLimit: number;
  declare upperLimit: number;
  declare nonconformanceId: number | null;
  declare heldById: number | null;
  declare heldAt: Date | null;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    SpcSignal.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        spcLimitsId: { type: DataTypes.INTEGER, allowNull: false },
        stageResultId: { type: DataTypes.INTEGER, allowNull: false },
        itemId: { type: DataTypes.INTEGER, allowNull: false },
        chart: { type: DataTypes.STRING(20), allowNull: false },
        rule: { type: DataTypes.SMALLINT, allowNull: false },
        value: { type: DataTypes.DOUBLE, allowNull: false },
        centre: { type: DataTypes.DOUBLE, allowNull: false },
        lowerLimit: { type: DataTypes.DOUBLE, allowNull: false },
        upperLimit: { type: DataTypes.DOUBLE, allowNull: false },
        nonconformanceId: { type: DataTypes.INTEGER, allowNull: true },
        heldById: { type: DataTypes.INTEGER, allowNull: true },
        heldAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'spc_signals', underscored: true, updatedAt: false },
    );
  }
}

/** A draft rule replayed over stored readings; the one the approver saw is kept with the approval. */
export class RuleRehearsal extends Model<InferAttributes<RuleRehearsal>, InferCreationAttributes<RuleRehearsal>> {
  declare id: CreationOptional<number>;
  declare toleranceRuleId: number;
  /** The draft's limits as they were rehearsed: a later edit makes the rehearsal stale. */
  declare ruleLimits: RehearsedLimits;
  declare periodFrom: Date;
  declare periodTo: Date;
  declare stationId: number | null;
  declare gaugeId: number | null;
  declare summary: RehearsalSummary;
  declare runById: number;
  declare keptWithApprovalAt: Date | null;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    RuleRehearsal.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        toleranceRuleId: { type: DataTypes.INTEGER, allowNull: false },
        ruleLimits: { type: DataTypes.JSONB, allowNull: false },
        periodFrom: { type: DataTypes.DATE, allowNull: false },
        periodTo: { type: DataTypes.DATE, allowNull: false },
        stationId: { type: DataTypes.INTEGER, allowNull: true },
        gaugeId: { type: DataTypes.INTEGER, allowNull: true },
        summary: { type: DataTypes.JSONB, allowNull: false },
        runById: { type: DataTypes.INTEGER, allowNull: false },
        keptWithApprovalAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'rule_rehearsals', underscored: true, updatedAt: false },
    );
  }
}
