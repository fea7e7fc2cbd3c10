import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

export type MailStatus = 'pending' | 'sending' | 'sent' | 'failed';

/**
 * The stored answer to a request sent with an Idempotency-Key, replayed when the client retries.
 * The request hash catches a key reused for a different request.
 */
export class IdempotencyKey extends Model<InferAttributes<IdempotencyKey>, InferCreationAttributes<IdempotencyKey>> {
  declare key: string;
  declare userId: number;
  declare method: string;
  declare path: string;
  declare requestHash: string;
  declare statusCode: number;
  declare response: unknown;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    IdempotencyKey.init(
      {
        key: { type: DataTypes.UUID, primaryKey: true },
        userId: { type: DataTypes.INTEGER, allowNull: false },
        method: { type: DataTypes.STRING(10), allowNull: false },
        path: { type: DataTypes.STRING(200), allowNull: false },
        requestHash: { type: DataTypes.CHAR(64), allowNull: false },
        statusCode: { type: DataTypes.SMALLINT, allowNull: false },
        response: { type: DataTypes.JSONB, allowNull: false },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'idempotency_keys', underscored: true, updatedAt: false },
    );
  }
}

/**
 * A message waiting to be sent (transactional outbox): written in the same transaction as the
 * change that causes it, delivered by a worker that claims rows with a lease (`claimedUntil`).
 */
export class MailOutbox extends Model<InferAttributes<MailOutbox>, InferCreationAttributes<MailOutbox>> {
  declare id: CreationOptional<number>;
  declare toAddress: string;
  declare subject: string;
  declare bodyText: string;
  declare bodyHtml: string | null;
  declare status: CreationOptional<MailStatus>;
  declare attempts: CreationOptional<number>;
  declare nextAttemptAt: CreationOptional<Date>;
  declare claimedBy: string | null;
  declare claimedUntil: Date | null;
  declare lastError: string | null;
  declare sentAt: Date | null;
  /** `<outbox-N@coretrail.local>`: the same on every attempt, so a resend is recognisable. */
  declare messageId: string | null;
  /** Why it was sent (ncr.raised, ncr.decided …), for the outbox page. */
  declare reason: CreationOptional<string>;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    MailOutbox.init(
      {
        id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
        toAddress: { type: DataTypes.STRING(254), allowNull: false },
        subject: { type: DataTypes.STRING(200), allowNull: false },
        bodyText: { type: DataTypes.TEXT, allowNull: false },
        bodyHtml: { type: DataTypes.TEXT, allowNull: true },
        status: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'pending' },
        attempts: { type: DataTypes.SMALLINT, allowNull: false, defaultValue: 0 },
        // the database's now(), not this process's clock: the worker's claim queries compare against it
        nextAttemptAt: { type: DataTypes.DATE, allowNull: false, defaultValue: sequelize.fn('now') },
        claimedBy: { type: DataTypes.STRING(80), allowNull: true },
        claimedUntil: { type: DataTypes.DATE, allowNull: true },
        lastError: { type: DataTypes.TEXT, allowNull: true },
        sentAt: { type: DataTypes.DATE, allowNull: true },
        messageId: { type: DataTypes.STRING(200), allowNull: true },
        reason: { type: DataTypes.STRING(60), allowNull: false, defaultValue: '' },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'mail_outbox', underscored: true, updatedAt: false },
    );
  }
}
