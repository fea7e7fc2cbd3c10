import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';
import type { PartKind } from '../../shared/schemas/reference.js';

export type RouteStatus = 'draft' | 'approved' | 'superseded' | 'discarded' | 'retired';

/** An operation a part goes through (crack test, line hone, run test …). */
export class Stage extends Model<InferAttributes<Stage>, InferCreationAttributes<Stage>> {
  declare id: CreationOptional<number>;
  declare code: string;
  declare name: string;
  declare partKind: PartKind;
  /** The caution shown at the station; `hazardous` marks work that can hurt someone. */
  declare hazard: string | null;
  declare hazardous: CreationOptional<boolean>;
  /** The unit's run test: the release gate requires it passed. */
  declare runTest: CreationOptional<boolean>;
  declare description: CreationOptional<string>;
  declare retiredAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Stage.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        code: { type: DataTypes.STRING(40), allowNull: false, unique: true },
        name: { type: DataTypes.STRING(80), allowNull: false },
        partKind: { type: DataTypes.STRING(20), allowNull: false },
        hazard: { type: DataTypes.STRING(300), allowNull: true },
        hazardous: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        runTest: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        description: { type: DataTypes.STRING(500), allowNull: false, defaultValue: '' },
        retiredAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'stages', underscored: true },
    );
  }
}

/** The ordered stages one part kind follows in one engine family. */
export class Route extends Model<InferAttributes<Route>, InferCreationAttributes<Route>> {
  declare id: CreationOptional<number>;
  declare engineFamilyId: number;
  declare partKind: PartKind;
  declare version: CreationOptional<number>;
  /** In force now (approved, not superseded or retired); the line reads use it. */
  declare active: CreationOptional<boolean>;
  declare status: CreationOptional<RouteStatus>;
  declare note: CreationOptional<string>;
  declare createdById: CreationOptional<number | null>;
  declare approvedById: CreationOptional<number | null>;
  declare approvedAt: CreationOptional<Date | null>;
  declare approvalReason: CreationOptional<string | null>;
  declare effectiveFrom: CreationOptional<Date | null>;
  declare supersededAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Route.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        engineFamilyId: { type: DataTypes.INTEGER, allowNull: false },
        partKind: { type: DataTypes.STRING(20), allowNull: false },
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
        active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        status: { type: DataTypes.STRING(12), allowNull: false, defaultValue: 'approved' },
        note: { type: DataTypes.STRING(500), allowNull: false, defaultValue: '' },
        createdById: { type: DataTypes.INTEGER, allowNull: true },
        approvedById: { type: DataTypes.INTEGER, allowNull: true },
        approvedAt: { type: DataTypes.DATE, allowNull: true },
        approvalReason: { type: DataTypes.STRING(500), allowNull: true },
        effectiveFrom: { type: DataTypes.DATE, allowNull: true },
        supersededAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'routes', underscored: true },
    );
  }
}

export class RouteStage extends Model<InferAttributes<RouteStage>, InferCreationAttributes<RouteStage>> {
  declare id: CreationOptional<number>;
  declare routeId: number;
  declare stageId: number;
  declare position: number;
  declare required: CreationOptional<boolean>;
  /** A part that fails this step goes back to that (earlier) stage of the route. */
  declare reworkToStageId: CreationOptional<number | null>;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    RouteStage.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        routeId: { type: DataTypes.INTEGER, allowNull: false },
        stageId: { type: DataTypes.INTEGER, allowNull: false },
        position: { type: DataTypes.SMALLINT, allowNull: false },
        required: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        reworkToStageId: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'route_stages', underscored: true, updatedAt: false },
    );
  }
}

/** A kind of part a route is for: the seven the product builds with, and any the plant adds. */
export class PartKindRow extends Model<InferAttributes<PartKindRow>, InferCreationAttributes<PartKindRow>> {
  declare code: string;
  declare name: string;
  declare serialized: CreationOptional<boolean>;
  declare builtIn: CreationOptional<boolean>;
  declare sortOrder: CreationOptional<number>;
  declare retiredAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    PartKindRow.init(
      {
        code: { type: DataTypes.STRING(20), primaryKey: true },
        name: { type: DataTypes.STRING(80), allowNull: false },
        serialized: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        builtIn: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        sortOrder: { type: DataTypes.SMALLINT, allowNull: false, defaultValue: 100 },
        retiredAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'part_kinds', underscored: true },
    );
  }
}

/** A casting number an engine family accepts at intake. */
export class FamilyCastingNumber extends Model<
  InferAttributes<FamilyCastingNumber>,
  InferCreationAttributes<FamilyCastingNumber>
> {
  declare id: CreationOptional<number>;
  declare engineFamilyId: number;
  declare castingNumber: string;
  declare partKind: CreationOptional<string>;
  declare note: CreationOptional<string>;
  declare retiredAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    FamilyCastingNumber.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        engineFamilyId: { type: DataTypes.INTEGER, allowNull: false },
        castingNumber: { type: DataTypes.STRING(40), allowNull: false },
        partKind: { type: DataTypes.STRING(20), allowNull: false, defaultValue: 'block' },
        note: { type: DataTypes.STRING(200), allowNull: false, defaultValue: '' },
        retiredAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'family_casting_numbers', underscored: true },
    );
  }
}
