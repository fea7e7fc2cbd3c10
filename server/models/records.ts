import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

// User foreign keys ending in `_by` are exposed as `…ById` so the association can take the plain
// name (`uploadedBy`, `releasedBy`) without a naming collision.

/** A stored file (photo, certificate) hung on any record through (entity, entityId). */
export class Attachment extends Model<InferAttributes<Attachment>, InferCreationAttributes<Attachment>> {
  declare id: CreationOptional<number>;
  declare entity: string;
  declare entityId: string;
  declare fileName: string;
  declare mimeType: string;
  declare sizeBytes: number;
  declare sha256: string;
  declare storageKey: string;
  declare uploadedById: number;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Attachment.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        entity: { type: DataTypes.STRING(40), allowNull: false },
        entityId: { type: DataTypes.STRING(40), allowNull: false },
        fileName: { type: DataTypes.STRING(200), allowNull: false },
        mimeType: { type: DataTypes.STRING(100), allowNull: false },
        sizeBytes: { type: DataTypes.INTEGER, allowNull: false },
        sha256: { type: DataTypes.CHAR(64), allowNull: false },
        storageKey: { type: DataTypes.STRING(200), allowNull: false, unique: true },
        uploadedById: { type: DataTypes.INTEGER, allowNull: false },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'attachments', underscored: true, updatedAt: false },
    );
  }
}

/** Each serial label printed; reprints are recorded so a duplicate tag on the floor can be explained. */
export class LabelPrint extends Model<InferAttributes<LabelPrint>, InferCreationAttributes<LabelPrint>> {
  declare id: CreationOptional<number>;
  declare itemId: number;
  declare printedById: number;
  declare stock: string;
  declare reprint: CreationOptional<boolean>;
  declare reprintReason: CreationOptional<string | null>;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    LabelPrint.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        itemId: { type: DataTypes.INTEGER, allowNull: false },
        printedById: { type: DataTypes.INTEGER, allowNull: false },
        stock: { type: DataTypes.STRING(20), allowNull: false },
        reprint: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        reprintReason: { type: DataTypes.STRING(300), allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'label_prints', underscored: true, updatedAt: false },
    );
  }
}

/** The release of one finished unit; warranty terms are copied from the family at ship time. */
export class Shipment extends Model<InferAttributes<Shipment>, InferCreationAttributes<Shipment>> {
  declare id: CreationOptional<number>;
  declare unitItemId: number;
  declare customerId: number | null;
  declare reference: string;
  declare carrier: string | null;
  declare shippedAt: Date;
  declare releasedById: number;
  /** Calendar date as `YYYY-MM-DD`. */
  declare warrantyEndsOn: string | null;
  declare warrantyKm: number | null;
  /** The day it left the dock (`YYYY-MM-DD`): the warranty term starts here. */
  declare shipDate: string | null;
  declare warrantyMonths: number | null;
  /** Set when the unit comes back (a warranty return); until then it cannot ship again. */
  declare returnedAt: Date | null;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Shipment.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        unitItemId: { type: DataTypes.INTEGER, allowNull: false },
        customerId: { type: DataTypes.INTEGER, allowNull: true },
        reference: { type: DataTypes.STRING(60), allowNull: false },
        carrier: { type: DataTypes.STRING(80), allowNull: true },
        shippedAt: { type: DataTypes.DATE, allowNull: false },
        releasedById: { type: DataTypes.INTEGER, allowNull: false },
        warrantyEndsOn: { type: DataTypes.DATEONLY, allowNull: true },
        warrantyKm: { type: DataTypes.INTEGER, allowNull: true },
        shipDate: { type: DataTypes.DATEONLY, allowNull: true },
        warrantyMonths: { type: DataTypes.SMALLINT, allowNull: true },
        returnedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'shipments', underscored: true, updatedAt: false },
    );
  }
}
