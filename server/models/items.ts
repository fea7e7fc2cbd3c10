import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';
import type { PartKind } from '../../shared/schemas/reference.js';

// User foreign keys ending in `_by` are exposed as `…ById` so the association can take the plain
// name (`createdBy`, `receivedBy`) without a naming collision.

export type CoreSource = 'customer_return' | 'purchased';
export type CreditDecision = 'full' | 'partial' | 'none';
export type LinkType = 'harvested_from' | 'installed_in';

/** Anything with a serial on the floor: a core as received, a part taken from it, a built unit. */
export class Item extends Model<InferAttributes<Item>, InferCreationAttributes<Item>> {
  declare id: CreationOptional<number>;
  declare serial: string;
  declare kind: PartKind;
  declare engineFamilyId: number;
  declare status: string;
  declare routeId: number | null;
  declare currentStageId: number | null;
  declare positionLabel: string | null;
  declare attributes: CreationOptional<Record<string, unknown>>;
  declare createdById: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Item.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        serial: { type: DataTypes.STRING(24), allowNull: false, unique: true },
        kind: { type: DataTypes.STRING(20), allowNull: false },
        engineFamilyId: { type: DataTypes.INTEGER, allowNull: false },
        status: { type: DataTypes.STRING(20), allowNull: false },
        routeId: { type: DataTypes.INTEGER, allowNull: true },
        currentStageId: { type: DataTypes.INTEGER, allowNull: true },
        positionLabel: { type: DataTypes.STRING(20), allowNull: true },
        attributes: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
        createdById: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'items', underscored: true },
    );
  }
}

/** How a core came in: its casting, where it came from, its condition and the credit decided. */
export class CoreReceipt extends Model<InferAttributes<CoreReceipt>, InferCreationAttributes<CoreReceipt>> {
  declare id: CreationOptional<number>;
  declare itemId: number;
  declare castingNumber: string;
  declare idNumber: string | null;
  declare source: CoreSource;
  declare customerId: number | null;
  declare supplierId: number | null;
  declare sourceReference: string | null;
  /** Calendar date as `YYYY-MM-DD`: the dock's day, not an instant. */
  declare receivedOn: string;
  declare receivedById: number;
  declare condition: CreationOptional<Record<string, unknown>>;
  declare grade: string | null;
  declare accepted: boolean;
  declare rejectReason: string | null;
  declare creditDecision: CreditDecision | null;
  declare creditReason: string | null;
  declare notes: CreationOptional<string>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    CoreReceipt.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        itemId: { type: DataTypes.INTEGER, allowNull: false, unique: true },
        castingNumber: { type: DataTypes.STRING(40), allowNull: false },
        idNumber: { type: DataTypes.STRING(40), allowNull: true },
        source: { type: DataTypes.STRING(20), allowNull: false },
        customerId: { type: DataTypes.INTEGER, allowNull: true },
        supplierId: { type: DataTypes.INTEGER, allowNull: true },
        sourceReference: { type: DataTypes.STRING(60), allowNull: true },
        receivedOn: { type: DataTypes.DATEONLY, allowNull: false },
        receivedById: { type: DataTypes.INTEGER, allowNull: false },
        condition: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
        grade: { type: DataTypes.STRING(20), allowNull: true },
        accepted: { type: DataTypes.BOOLEAN, allowNull: false },
        rejectReason: { type: DataTypes.STRING(500), allowNull: true },
        creditDecision: { type: DataTypes.STRING(10), allowNull: true },
        creditReason: { type: DataTypes.STRING(500), allowNull: true },
        notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'core_receipts', underscored: true },
    );
  }
}

/**
 * Genealogy edge between two items. A link is ended with `removedAt`, not deleted, so the history of
 * which part sat in which unit survives a teardown.
 */
export class ItemLink extends Model<InferAttributes<ItemLink>, InferCreationAttributes<ItemLink>> {
  declare id: CreationOptional<number>;
  declare parentItemId: number;
  declare childItemId: number;
  declare linkType: LinkType;
  declare createdById: number | null;
  declare removedAt: Date | null;
  declare removedReason: string | null;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    ItemLink.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        parentItemId: { type: DataTypes.INTEGER, allowNull: false },
        childItemId: { type: DataTypes.INTEGER, allowNull: false },
        linkType: { type: DataTypes.STRING(20), allowNull: false },
        createdById: { type: DataTypes.INTEGER, allowNull: true },
        removedAt: { type: DataTypes.DATE, allowNull: true },
        removedReason: { type: DataTypes.STRING(300), allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'item_links', underscored: true, updatedAt: false },
    );
  }
}
