import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

export type ClaimState = 'received' | 'torn_down' | 'decided' | 'closed';
export type ClaimDecision = 'accepted' | 'rejected' | 'goodwill';

/** The plant's own list of what a returned unit's trouble came from. */
export class CauseCode extends Model<InferAttributes<CauseCode>, InferCreationAttributes<CauseCode>> {
  declare id: CreationOptional<number>;
  declare code: string;
  declare description: string;
  /** False for "no trouble found", "installation" and the like: a claim, not a failure of the product. */
  declare countsAsFailure: CreationOptional<boolean>;
  declare active: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    CauseCode.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        code: { type: DataTypes.STRING(20), allowNull: false, unique: true },
        description: { type: DataTypes.STRING(200), allowNull: false },
        countsAsFailure: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'cause_codes', underscored: true },
    );
  }
}

/**
 * A warranty claim on a shipped unit: received (logged, with its coverage as worked out then), torn
 * down (the returned unit's findings), decided, closed; each step signed.
 */
export class WarrantyClaim extends Model<InferAttributes<WarrantyClaim>, InferCreationAttributes<WarrantyClaim>> {
  declare id: CreationOptional<number>;
  declare number: string;
  declare unitItemId: number;
  declare shipmentId: number;
  declare customerId: number;
  declare customerReference: CreationOptional<string>;
  /** `YYYY-MM-DD`, the plant's calendar. */
  declare failedOn: string;
  declare distanceKm: number | null;
  declare hours: number | null;
  declare symptom: string;
  declare installer: string;
  declare covered: boolean;
  declare coverageReason: string;
  declare warrantyEndsOn: string;
  declare state: CreationOptional<ClaimState>;
  declare unitReturnedAt: Date | null;
  declare returnedById: number | null;
  declare tornDownAt: Date | null;
  declare tornDownById: number | null;
  declare teardownNotes: CreationOptional<string>;
  declare decision: ClaimDecision | null;
  declare decisionReason: string | null;
  declare decidedById: number | null;
  declare decidedAt: Date | null;
  declare closedById: number | null;
  declare closedAt: Date | null;
  declare openedById: number;
  declare demo: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    WarrantyClaim.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        number: { type: DataTypes.STRING(20), allowNull: false, unique: true },
        unitItemId: { type: DataTypes.INTEGER, allowNull: false },
        shipmentId: { type: DataTypes.INTEGER, allowNull: false },
        customerId: { type: DataTypes.INTEGER, allowNull: false },
        customerReference: { type: DataTypes.STRING(60), allowNull: false, defaultValue: '' },
        failedOn: { type: DataTypes.DATEONLY, allowNull: false },
        distanceKm: { type: DataTypes.INTEGER, allowNull: true },
        hours: { type: DataTypes.DECIMAL(8, 1), allowNull: true },
        symptom: { type: DataTypes.TEXT, allowNull: false },
        installer: { type: DataTypes.STRING(160), allowNull: false },
        covered: { type: DataTypes.BOOLEAN, allowNull: false },
        coverageReason: { type: DataTypes.STRING(400), allowNull: false },
        warrantyEndsOn: { type: DataTypes.DATEONLY, allowNull: false },
        state: { type: DataTypes.STRING(12), allowNull: false, defaultValue: 'received' },
        unitReturnedAt: { type: DataTypes.DATE, allowNull: true },
        returnedById: { type: DataTypes.INTEGER, allowNull: true },
        tornDownAt: { type: DataTypes.DATE, allowNull: true },
        tornDownById: { type: DataTypes.INTEGER, allowNull: true },
        teardownNotes: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        decision: { type: DataTypes.STRING(10), allowNull: true },
        decisionReason: { type: DataTypes.TEXT, allowNull: true },
        decidedById: { type: DataTypes.INTEGER, allowNull: true },
        decidedAt: { type: DataTypes.DATE, allowNull: true },
        closedById: { type: DataTypes.INTEGER, allowNull: true },
        closedAt: { type: DataTypes.DATE, allowNull: true },
        openedById: { type: DataTypes.INTEGER, allowNull: false },
        demo: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'warranty_claims', underscored: true },
    );
  }
}

export type TeardownMeasurement = { characteristic: string; position: string; value: number; unit: string | null };

/** One thing teardown found, against the part (or unit) or purchased lot it concerns. Never edited. */
export class WarrantyFinding extends Model<InferAttributes<WarrantyFinding>, InferCreationAttributes<WarrantyFinding>> {
  declare id: CreationOptional<number>;
  declare claimId: number;
  declare itemId: number | null;
  declare partLotId: number | null;
  declare causeCodeId: number;
  declare description: string;
  declare measurements: CreationOptional<TeardownMeasurement[]>;
  declare recordedById: number;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    WarrantyFinding.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        claimId: { type: DataTypes.INTEGER, allowNull: false },
        itemId: { type: DataTypes.INTEGER, allowNull: true },
        partLotId: { type: DataTypes.INTEGER, allowNull: true },
        causeCodeId: { type: DataTypes.INTEGER, allowNull: false },
        description: { type: DataTypes.TEXT, allowNull: false },
        measurements: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
        recordedById: { type: DataTypes.INTEGER, allowNull: false },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'warranty_findings', underscored: true, updatedAt: false },
    );
  }
}

/** A core's credit settled after its teardown: a new record each time; the dock's decision stays. */
export class CoreCreditRevision extends Model<
  InferAttributes<CoreCreditRevision>,
  InferCreationAttributes<CoreCreditRevision>
> {
  declare id: CreationOptional<number>;
  declare coreItemId: number;
  declare creditDecision: 'full' | 'partial' | 'none';
  declare reason: string;
  declare revisedById: number;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    CoreCreditRevision.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        coreItemId: { type: DataTypes.INTEGER, allowNull: false },
        creditDecision: { type: DataTypes.STRING(10), allowNull: false },
        reason: { type: DataTypes.STRING(500), allowNull: false },
        revisedById: { type: DataTypes.INTEGER, allowNull: false },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'core_credit_revisions', underscored: true, updatedAt: false },
    );
  }
}
