import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';
import type { PartKind } from '../../shared/schemas/reference.js';

/** An operation a part goes through (crack test, line hone, run test …). */
export class Stage extends Model<InferAttributes<Stage>, InferCreationAttributes<Stage>> {
  declare id: CreationOptional<number>;
  declare code: string;
  declare name: string;
  declare partKind: PartKind;
  declare hazard: string | null;
  declare description: CreationOptional<string>;
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
        description: { type: DataTypes.STRING(500), allowNull: false, defaultValue: '' },
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
  declare active: CreationOptional<boolean>;
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
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    RouteStage.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        routeId: { type: DataTypes.INTEGER, allowNull: false },
        stageId: { type: DataTypes.INTEGER, allowNull: false },
        position: { type: DataTypes.SMALLINT, allowNull: false },
        required: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'route_stages', underscored: true, updatedAt: false },
    );
  }
}
