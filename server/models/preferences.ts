import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

/** The unit a person prefers to type readings in, for characteristics kept in `unit`: a setting, not a record. */
export class UnitPreference extends Model<InferAttributes<UnitPreference>, InferCreationAttributes<UnitPreference>> {
  declare userId: number;
  declare unit: string;
  declare enteredUnit: string;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    UnitPreference.init(
      {
        userId: { type: DataTypes.INTEGER, allowNull: false, primaryKey: true },
        unit: { type: DataTypes.STRING(20), allowNull: false, primaryKey: true },
        enteredUnit: { type: DataTypes.STRING(20), allowNull: false },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'unit_preferences', underscored: true },
    );
  }
}
