import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

/**
 * One append-only entry of the audit trail; the Merkle log (server/ledger/) gives it a leaf. Events
 * written before the log keep their hash chain (`prevHash`, `hash`); later ones have neither.
 * The database refuses UPDATE and DELETE.
 */
export class AuditEvent extends Model<InferAttributes<AuditEvent>, InferCreationAttributes<AuditEvent>> {
  declare id: CreationOptional<number>;
  declare occurredAt: Date;
  declare actorId: number | null;
  declare actorRole: string | null;
  declare action: string;
  declare entity: string;
  declare entityId: string;
  declare before: unknown;
  declare after: unknown;
  declare requestId: string | null;
  declare prevHash: CreationOptional<string | null>;
  declare hash: CreationOptional<string | null>;

  static initModel(sequelize: Sequelize) {
    AuditEvent.init(
      {
        id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
        occurredAt: { type: DataTypes.DATE, allowNull: false },
        actorId: { type: DataTypes.INTEGER, allowNull: true },
        actorRole: { type: DataTypes.STRING(20), allowNull: true },
        action: { type: DataTypes.STRING(60), allowNull: false },
        entity: { type: DataTypes.STRING(40), allowNull: false },
        entityId: { type: DataTypes.STRING(40), allowNull: false },
        before: { type: DataTypes.JSONB, allowNull: true },
        after: { type: DataTypes.JSONB, allowNull: true },
        requestId: { type: DataTypes.STRING(64), allowNull: true },
        prevHash: { type: DataTypes.CHAR(64), allowNull: true },
        hash: { type: DataTypes.CHAR(64), allowNull: true, unique: true },
      },
      { sequelize, tableName: 'audit_events', underscored: true, timestamps: false },
    );
  }
}
