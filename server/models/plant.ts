import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

/** The plant itself, one row: its name and address for documents, and the calendar it keeps. */
export class PlantSettings extends Model<InferAttributes<PlantSettings>, InferCreationAttributes<PlantSettings>> {
  declare id: CreationOptional<number>;
  declare name: string;
  declare address: string;
  /** An IANA zone such as `America/Chicago`: ship dates, due dates and "today" are the plant's days. */
  declare timeZone: string;
  /** An open NCR older than this many days is shown as overdue on the homes. */
  declare ncrOverdueDays: CreationOptional<number>;
  /** A part on hold longer than this many hours is shown as an alert. */
  declare holdAlertHours: CreationOptional<number>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    PlantSettings.init(
      {
        id: { type: DataTypes.SMALLINT, primaryKey: true, defaultValue: 1 },
        name: { type: DataTypes.STRING(120), allowNull: false },
        address: { type: DataTypes.STRING(300), allowNull: false },
        timeZone: { type: DataTypes.STRING(60), allowNull: false },
        ncrOverdueDays: { type: DataTypes.SMALLINT, allowNull: false, defaultValue: 7 },
        holdAlertHours: { type: DataTypes.SMALLINT, allowNull: false, defaultValue: 48 },
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'plant_settings', underscored: true, createdAt: false },
    );
  }
}

export type FieldActionDecision = 'no_action' | 'notify_customer' | 'recall';

/**
 * A problem found in something that has already shipped: one row per shipment and NCR, open until
 * quality signs what is to be done about the units in the field.
 */
export class FieldAction extends Model<InferAttributes<FieldAction>, InferCreationAttributes<FieldAction>> {
  declare id: CreationOptional<number>;
  declare number: string;
  declare shipmentId: number;
  declare unitItemId: number;
  declare nonconformanceId: number;
  declare state: CreationOptional<'open' | 'closed'>;
  declare decision: FieldActionDecision | null;
  declare decisionReason: string | null;
  declare decidedById: number | null;
  declare decidedAt: Date | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    FieldAction.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        number: { type: DataTypes.STRING(20), allowNull: false, unique: true },
        shipmentId: { type: DataTypes.INTEGER, allowNull: false },
        unitItemId: { type: DataTypes.INTEGER, allowNull: false },
        nonconformanceId: { type: DataTypes.INTEGER, allowNull: false },
        state: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'open' },
        decision: { type: DataTypes.STRING(20), allowNull: true },
        decisionReason: { type: DataTypes.STRING(1000), allowNull: true },
        decidedById: { type: DataTypes.INTEGER, allowNull: true },
        decidedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'field_actions', underscored: true },
    );
  }
}
