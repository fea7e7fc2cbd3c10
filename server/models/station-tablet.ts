import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

/** A tablet enrolled to one station: it reads that station's forms; people identify on it per result. */
export class StationTablet extends Model<InferAttributes<StationTablet>, InferCreationAttributes<StationTablet>> {
  declare id: CreationOptional<number>;
  declare stationId: number;
  declare label: string;
  declare enrolledById: number;
  declare retiredAt: CreationOptional<Date | null>;
  declare retiredById: CreationOptional<number | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    StationTablet.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        stationId: { type: DataTypes.INTEGER, allowNull: false },
        label: { type: DataTypes.STRING(80), allowNull: false },
        enrolledById: { type: DataTypes.INTEGER, allowNull: false },
        retiredAt: { type: DataTypes.DATE, allowNull: true },
        retiredById: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'station_tablets', underscored: true },
    );
  }
}
