import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

/** A supplier's batch of new parts (pistons, bearings …), the unit of a supplier recall. */
export class PartLot extends Model<InferAttributes<PartLot>, InferCreationAttributes<PartLot>> {
  declare id: CreationOptional<number>;
  declare supplierId: number;
  declare partKind: string;
  declare partNumber: string;
  declare lotCode: string;
  declare description: CreationOptional<string>;
  declare attributes: CreationOptional<Record<string, unknown>>;
  declare status: CreationOptional<string>;
  /** What receiving logged, and how much builds have drawn of it (never more than received). */
  declare quantityReceived: CreationOptional<number>;
  declare quantityDrawn: CreationOptional<number>;
  declare receivedOn: CreationOptional<string>;
  declare receivedById: CreationOptional<number | null>;
  /** Receiving inspection: only an accepted lot can be drawn. */
  declare inspection: CreationOptional<'pending' | 'accepted' | 'on_hold' | 'refused'>;
  declare inspectionReason: CreationOptional<string | null>;
  declare certificateAttachmentId: CreationOptional<number | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    PartLot.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        supplierId: { type: DataTypes.INTEGER, allowNull: false },
        partKind: { type: DataTypes.STRING(40), allowNull: false },
        partNumber: { type: DataTypes.STRING(60), allowNull: false },
        lotCode: { type: DataTypes.STRING(60), allowNull: false },
        description: { type: DataTypes.STRING(200), allowNull: false, defaultValue: '' },
        attributes: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
        status: { type: DataTypes.STRING(20), allowNull: false, defaultValue: 'usable' },
        quantityReceived: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        quantityDrawn: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        // NOT NULL in the table, whose default (CURRENT_DATE) fills it when left out
        receivedOn: { type: DataTypes.DATEONLY, allowNull: true },
        receivedById: { type: DataTypes.INTEGER, allowNull: true },
        inspection: { type: DataTypes.STRING(12), allowNull: false, defaultValue: 'pending' },
        inspectionReason: { type: DataTypes.STRING(500), allowNull: true },
        certificateAttachmentId: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'part_lots', underscored: true },
    );
  }
}

/** Parts from one lot fitted to one built unit; answers "which units got lot X?". */
export class UnitLot extends Model<InferAttributes<UnitLot>, InferCreationAttributes<UnitLot>> {
  declare id: CreationOptional<number>;
  declare unitItemId: number;
  declare partLotId: number;
  declare quantity: CreationOptional<number>;
  /** The size class of the lot built in, and the part and class it was matched to. */
  declare sizeClass: CreationOptional<string | null>;
  declare matchedTo: CreationOptional<string | null>;
  // `…ById` so the association can be called `createdBy` without colliding with the column
  declare createdById: number | null;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    UnitLot.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        unitItemId: { type: DataTypes.INTEGER, allowNull: false },
        partLotId: { type: DataTypes.INTEGER, allowNull: false },
        quantity: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
        sizeClass: { type: DataTypes.STRING(20), allowNull: true },
        matchedTo: { type: DataTypes.STRING(200), allowNull: true },
        createdById: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'unit_lots', underscored: true, updatedAt: false },
    );
  }
}
