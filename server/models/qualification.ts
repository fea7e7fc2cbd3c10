import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

/** A person's sign-off to record a stage, from the day trained to the day it expires. */
export class Qualification extends Model<InferAttributes<Qualification>, InferCreationAttributes<Qualification>> {
  declare id: CreationOptional<number>;
  declare userId: number;
  declare stageId: number;
  declare trainedOn: string;
  declare expiresOn: string;
  declare signedById: number;
  declare signatureId: number;
  declare withdrawnAt: CreationOptional<Date | null>;
  declare withdrawnById: CreationOptional<number | null>;
  declare withdrawnReason: CreationOptional<string | null>;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Qualification.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        userId: { type: DataTypes.INTEGER, allowNull: false },
        stageId: { type: DataTypes.INTEGER, allowNull: false },
        trainedOn: { type: DataTypes.DATEONLY, allowNull: false },
        expiresOn: { type: DataTypes.DATEONLY, allowNull: false },
        signedById: { type: DataTypes.INTEGER, allowNull: false },
        signatureId: { type: DataTypes.INTEGER, allowNull: false },
        withdrawnAt: { type: DataTypes.DATE, allowNull: true },
        withdrawnById: { type: DataTypes.INTEGER, allowNull: true },
        withdrawnReason: { type: DataTypes.STRING(500), allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'qualifications', underscored: true, updatedAt: false },
    );
  }
}
