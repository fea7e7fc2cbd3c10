import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

/** A signed-in browser. The JWT carries this id; revoking the row ends that sign-in. */
export class Session extends Model<InferAttributes<Session>, InferCreationAttributes<Session>> {
  declare id: string;
  declare userId: number;
  declare tokenVersion: number;
  declare ip: string | null;
  declare userAgent: string | null;
  declare expiresAt: Date;
  declare revokedAt: Date | null;
  /** Moved forward at most once a minute; a session idle past its role's limit counts as signed out. */
  declare lastSeenAt: CreationOptional<Date>;
  /** An admin signed in without a second factor: this session may only enrol one. */
  declare enrolOnly: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Session.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true },
        userId: { type: DataTypes.INTEGER, allowNull: false },
        tokenVersion: { type: DataTypes.INTEGER, allowNull: false },
        ip: { type: DataTypes.STRING(64), allowNull: true },
        userAgent: { type: DataTypes.STRING(300), allowNull: true },
        expiresAt: { type: DataTypes.DATE, allowNull: false },
        revokedAt: { type: DataTypes.DATE, allowNull: true },
        lastSeenAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
        enrolOnly: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'sessions', underscored: true, updatedAt: false },
    );
  }
}
