import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';
import type { ImportPlan, ProcessDocument } from '../../shared/schemas/process-document.js';

/** A process document imported as a draft, applied when someone other than its author signs it. */
export class ProcessImport extends Model<InferAttributes<ProcessImport>, InferCreationAttributes<ProcessImport>> {
  declare id: CreationOptional<number>;
  declare status: CreationOptional<'draft' | 'approved' | 'discarded'>;
  declare document: ProcessDocument;
  /** What it adds and which routes it brings to a new version, as checked against the plant. */
  declare plan: ImportPlan;
  declare note: CreationOptional<string>;
  // `…ById` so the associations can be called `createdBy`/`approvedBy` without colliding
  declare createdById: number;
  declare approvedById: CreationOptional<number | null>;
  declare approvedAt: CreationOptional<Date | null>;
  declare approvalReason: CreationOptional<string | null>;
  declare effectiveFrom: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    ProcessImport.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        status: { type: DataTypes.STRING(12), allowNull: false, defaultValue: 'draft' },
        document: { type: DataTypes.JSONB, allowNull: false },
        plan: { type: DataTypes.JSONB, allowNull: false },
        note: { type: DataTypes.STRING(500), allowNull: false, defaultValue: '' },
        createdById: { type: DataTypes.INTEGER, allowNull: false },
        approvedById: { type: DataTypes.INTEGER, allowNull: true },
        approvedAt: { type: DataTypes.DATE, allowNull: true },
        approvalReason: { type: DataTypes.STRING(500), allowNull: true },
        effectiveFrom: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'process_imports', underscored: true },
    );
  }
}
