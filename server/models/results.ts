import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

import type { ChosenSizeClass } from '../../shared/schemas/results.js';

export type Verdict = 'pass' | 'fail';

/**
 * One pass of an item through a stage. A result is never rewritten: a correction is a new row that
 * `supersedes` it (a unique index lets each result be superseded once), and the old row stays as it was.
 */
export class StageResult extends Model<InferAttributes<StageResult>, InferCreationAttributes<StageResult>> {
  declare id: CreationOptional<number>;
  declare itemId: number;
  declare stageId: number;
  declare stationId: number | null;
  declare operatorId: number;
  declare gaugeId: number | null;
  declare startedAt: Date | null;
  declare finishedAt: Date;
  /** When it was taken on the tablet; a result queued offline is stored (`finishedAt`) later. */
  declare takenAt: CreationOptional<Date | null>;
  declare verdict: Verdict;
  /** Sent by the tablet so a retried submission cannot record the same result twice. */
  declare idempotencyKey: string;
  declare supersedesId: number | null;
  declare correctionReason: string | null;
  declare reentryReason: string | null;
  // `…ById` so the association can be called `reentryBy` without colliding with the column
  declare reentryById: number | null;
  declare notes: CreationOptional<string>;
  /** The shared station tablet the result came from, when the person identified on one. */
  declare tabletId: CreationOptional<number | null>;
  /** The size class chosen per characteristic code, with the rule version it came from. */
  declare sizeClasses: CreationOptional<Record<string, ChosenSizeClass>>;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    StageResult.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        itemId: { type: DataTypes.INTEGER, allowNull: false },
        stageId: { type: DataTypes.INTEGER, allowNull: false },
        stationId: { type: DataTypes.INTEGER, allowNull: true },
        operatorId: { type: DataTypes.INTEGER, allowNull: false },
        gaugeId: { type: DataTypes.INTEGER, allowNull: true },
        startedAt: { type: DataTypes.DATE, allowNull: true },
        finishedAt: { type: DataTypes.DATE, allowNull: false },
        takenAt: { type: DataTypes.DATE, allowNull: true },
        verdict: { type: DataTypes.STRING(10), allowNull: false },
        idempotencyKey: { type: DataTypes.UUID, allowNull: false, unique: true },
        supersedesId: { type: DataTypes.INTEGER, allowNull: true },
        correctionReason: { type: DataTypes.STRING(500), allowNull: true },
        reentryReason: { type: DataTypes.STRING(500), allowNull: true },
        reentryById: { type: DataTypes.INTEGER, allowNull: true },
        notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        tabletId: { type: DataTypes.INTEGER, allowNull: true },
        sizeClasses: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'stage_results', underscored: true, updatedAt: false },
    );
  }
}

/**
 * One value (or pass/fail judgement) of one characteristic at one position. The rule id and version
 * are copied in so the verdict can be re-explained after the rule is superseded.
 */
export class Reading extends Model<InferAttributes<Reading>, InferCreationAttributes<Reading>> {
  declare id: CreationOptional<number>;
  declare stageResultId: number;
  declare characteristicId: number;
  declare position: CreationOptional<string>;
  /** Null for attribute characteristics, which carry `passed` instead. */
  declare value: number | null;
  declare passed: boolean | null;
  declare locationNote: string | null;
  declare unit: string | null;
  /** What was typed, when it was typed in another unit than the characteristic's (both or neither). */
  declare enteredValue: CreationOptional<number | null>;
  declare enteredUnit: CreationOptional<string | null>;
  declare verdict: Verdict;
  declare toleranceRuleId: number | null;
  declare ruleVersion: number | null;
  declare gaugeId: number | null;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Reading.init(
      {
        id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
        stageResultId: { type: DataTypes.INTEGER, allowNull: false },
        characteristicId: { type: DataTypes.INTEGER, allowNull: false },
        position: { type: DataTypes.STRING(40), allowNull: false, defaultValue: '' },
        value: { type: DataTypes.DECIMAL(14, 6), allowNull: true },
        passed: { type: DataTypes.BOOLEAN, allowNull: true },
        locationNote: { type: DataTypes.STRING(200), allowNull: true },
        unit: { type: DataTypes.STRING(20), allowNull: true },
        enteredValue: { type: DataTypes.DECIMAL(14, 6), allowNull: true },
        enteredUnit: { type: DataTypes.STRING(20), allowNull: true },
        verdict: { type: DataTypes.STRING(10), allowNull: false },
        toleranceRuleId: { type: DataTypes.INTEGER, allowNull: true },
        ruleVersion: { type: DataTypes.INTEGER, allowNull: true },
        gaugeId: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'readings', underscored: true, updatedAt: false },
    );
  }
}

/**
 * A supervisor's permission for an item to go back through a stage it has passed. The next result
 * recorded there carries the reason, and marks the re-entry used.
 */
export class StageReentry extends Model<InferAttributes<StageReentry>, InferCreationAttributes<StageReentry>> {
  declare id: CreationOptional<number>;
  declare itemId: number;
  declare stageId: number;
  declare fromStageId: number | null;
  declare fromStatus: string;
  declare reason: string;
  declare allowedById: number;
  declare usedByResultId: number | null;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    StageReentry.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        itemId: { type: DataTypes.INTEGER, allowNull: false },
        stageId: { type: DataTypes.INTEGER, allowNull: false },
        fromStageId: { type: DataTypes.INTEGER, allowNull: true },
        fromStatus: { type: DataTypes.STRING(20), allowNull: false },
        reason: { type: DataTypes.STRING(500), allowNull: false },
        allowedById: { type: DataTypes.INTEGER, allowNull: false },
        usedByResultId: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'stage_reentries', underscored: true, updatedAt: false },
    );
  }
}
