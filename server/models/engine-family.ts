import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

export class EngineFamily extends Model<InferAttributes<EngineFamily>, InferCreationAttributes<EngineFamily>> {
  declare id: CreationOptional<number>;
  declare code: string;
  declare name: string;
  declare description: CreationOptional<string>;
  declare layout: 'inline' | 'v';
  declare cylinders: number;
  declare boreMm: number;
  declare strokeMm: number;
  declare headsPerEngine: number;
  declare warrantyMonths: number;
  declare warrantyKm: number | null;
  declare active: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    EngineFamily.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        code: { type: DataTypes.STRING(20), allowNull: false, unique: true },
        name: { type: DataTypes.STRING(80), allowNull: false },
        description: { type: DataTypes.STRING(500), allowNull: false, defaultValue: '' },
        layout: { type: DataTypes.STRING(10), allowNull: false },
        cylinders: { type: DataTypes.SMALLINT, allowNull: false },
        boreMm: { type: DataTypes.DECIMAL(7, 3), allowNull: false },
        strokeMm: { type: DataTypes.DECIMAL(7, 3), allowNull: false },
        headsPerEngine: { type: DataTypes.SMALLINT, allowNull: false },
        warrantyMonths: { type: DataTypes.SMALLINT, allowNull: false },
        warrantyKm: { type: DataTypes.INTEGER, allowNull: true },
        active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'engine_families', underscored: true },
    );
  }
}
