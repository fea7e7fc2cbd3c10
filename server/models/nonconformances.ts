import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

export type Severity = 'critical' | 'major' | 'minor';
export type Disposition = 'use_as_is' | 'rework' | 'repair' | 'scrap' | 'return_to_supplier';

export class DefectCode extends Model<InferAttributes<DefectCode>, InferCreationAttributes<DefectCode>> {
  declare id: CreationOptional<number>;
  declare code: string;
  declare description: string;
  declare active: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    DefectCode.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        code: { type: DataTypes.STRING(20), allowNull: false, unique: true },
        description: { type: DataTypes.STRING(200), allowNull: false },
        active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'defect_codes', underscored: true },
    );
  }
}

/** A nonconformance report (NCR) against an item or a supplier's part lot; at least one is set. */
export class Nonconformance extends Model<InferAttributes<Nonconformance>, InferCreationAttributes<Nonconformance>> {
  declare id: CreationOptional<number>;
  declare number: string;
  declare itemId: number | null;
  declare partLotId: number | null;
  declare stageResultId: number | null;
  declare stageId: number | null;
  declare defectCodeId: number | null;
  declare severity: Severity;
  declare state: string;
  declare description: string;
  /** A snapshot of the out-of-limit readings as they were when the NCR was raised. */
  declare failing: CreationOptional<Record<string, unknown>[]>;
  declare containment: CreationOptional<string>;
  declare disposition: Disposition | null;
  declare dispositionReason: string | null;
  declare reworkStageId: number | null;
  // `…ById` so the association can be called `raisedBy` without colliding with the column
  declare raisedById: number;
  declare assigneeId: number | null;
  declare closedAt: Date | null;
  /** What the item was doing before this NCR held it, to put it back when a concern is closed. */
  declare itemStatusBefore: string | null;
  /** A use-as-is on a critical NCR: signed once, waiting for a second quality signer. */
  declare awaitingSecondSignature: CreationOptional<boolean>;
  declare decidedById: number | null;
  declare decidedAt: Date | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Nonconformance.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        number: { type: DataTypes.STRING(20), allowNull: false, unique: true },
        itemId: { type: DataTypes.INTEGER, allowNull: true },
        partLotId: { type: DataTypes.INTEGER, allowNull: true },
        stageResultId: { type: DataTypes.INTEGER, allowNull: true },
        stageId: { type: DataTypes.INTEGER, allowNull: true },
        defectCodeId: { type: DataTypes.INTEGER, allowNull: true },
        severity: { type: DataTypes.STRING(10), allowNull: false },
        state: { type: DataTypes.STRING(20), allowNull: false },
        description: { type: DataTypes.TEXT, allowNull: false },
        failing: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
        containment: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        disposition: { type: DataTypes.STRING(20), allowNull: true },
        dispositionReason: { type: DataTypes.TEXT, allowNull: true },
        reworkStageId: { type: DataTypes.INTEGER, allowNull: true },
        raisedById: { type: DataTypes.INTEGER, allowNull: false },
        assigneeId: { type: DataTypes.INTEGER, allowNull: true },
        closedAt: { type: DataTypes.DATE, allowNull: true },
        itemStatusBefore: { type: DataTypes.STRING(20), allowNull: true },
        awaitingSecondSignature: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        decidedById: { type: DataTypes.INTEGER, allowNull: true },
        decidedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'nonconformances', underscored: true },
    );
  }
}

/** One step of an NCR's life, kept so the path to a disposition can be shown and audited. */
export class NonconformanceTransition extends Model<
  InferAttributes<NonconformanceTransition>,
  InferCreationAttributes<NonconformanceTransition>
> {
  declare id: CreationOptional<number>;
  declare nonconformanceId: number;
  /** Null for the transition that opens the NCR. */
  declare fromState: string | null;
  declare toState: string;
  declare actorId: number;
  declare reason: CreationOptional<string>;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    NonconformanceTransition.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        nonconformanceId: { type: DataTypes.INTEGER, allowNull: false },
        fromState: { type: DataTypes.STRING(20), allowNull: true },
        toState: { type: DataTypes.STRING(20), allowNull: false },
        actorId: { type: DataTypes.INTEGER, allowNull: false },
        reason: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'nonconformance_transitions', underscored: true, updatedAt: false },
    );
  }
}

/**
 * An electronic signature: who signed, the name as printed at the time and what the signature
 * means ("disposition approved"). Polymorphic on (entity, entityId), so it has no foreign key to
 * the signed record.
 */
export class Signature extends Model<InferAttributes<Signature>, InferCreationAttributes<Signature>> {
  declare id: CreationOptional<number>;
  declare userId: number;
  declare printedName: string;
  declare meaning: string;
  /** Why the signer signed, in their words (a disposition's reason, an approval's, a release's order). */
  declare reason: CreationOptional<string>;
  declare entity: string;
  declare entityId: string;
  declare signedAt: Date;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Signature.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        userId: { type: DataTypes.INTEGER, allowNull: false },
        printedName: { type: DataTypes.STRING(120), allowNull: false },
        meaning: { type: DataTypes.STRING(120), allowNull: false },
        reason: { type: DataTypes.STRING(500), allowNull: false, defaultValue: '' },
        entity: { type: DataTypes.STRING(40), allowNull: false },
        entityId: { type: DataTypes.STRING(40), allowNull: false },
        signedAt: { type: DataTypes.DATE, allowNull: false },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'signatures', underscored: true, updatedAt: false },
    );
  }
}
