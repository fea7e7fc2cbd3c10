import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';
import type { CharacteristicDefinition } from '../../shared/schemas/characteristic-versions.js';

/** One version of a characteristic's definition, under change control. */
export class CharacteristicVersion extends Model<
  InferAttributes<CharacteristicVersion>,
  InferCreationAttributes<CharacteristicVersion>
> {
  declare id: CreationOptional<number>;
  declare characteristicId: number;
  declare version: number;
  declare status: CreationOptional<'draft' | 'approved' | 'superseded' | 'discarded'>;
  declare definition: CharacteristicDefinition;
  declare note: CreationOptional<string>;
  // `…ById` so the associations can be called `createdBy`/`approvedBy` without colliding
  declare createdById: number | null;
  declare approvedById: CreationOptional<number | null>;
  declare approvedAt: CreationOptional<Date | null>;
  declare approvalReason: CreationOptional<string | null>;
  declare effectiveFrom: CreationOptional<Date | null>;
  /** When it was written onto the characteristic (its effective time, or the first read after). */
  declare appliedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    CharacteristicVersion.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        characteristicId: { type: DataTypes.INTEGER, allowNull: false },
        version: { type: DataTypes.INTEGER, allowNull: false },
        status: { type: DataTypes.STRING(12), allowNull: false, defaultValue: 'draft' },
        definition: { type: DataTypes.JSONB, allowNull: false },
        note: { type: DataTypes.STRING(500), allowNull: false, defaultValue: '' },
        createdById: { type: DataTypes.INTEGER, allowNull: true },
        approvedById: { type: DataTypes.INTEGER, allowNull: true },
        approvedAt: { type: DataTypes.DATE, allowNull: true },
        approvalReason: { type: DataTypes.STRING(500), allowNull: true },
        effectiveFrom: { type: DataTypes.DATE, allowNull: true },
        appliedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'characteristic_versions', underscored: true },
    );
  }
}
