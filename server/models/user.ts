import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';
import type { Role } from '../../shared/roles.js';

export class User extends Model<InferAttributes<User>, InferCreationAttributes<User>> {
  declare id: CreationOptional<number>;
  declare email: string;
  declare name: string;
  declare role: Role;
  declare passwordHash: string;
  declare tokenVersion: CreationOptional<number>;
  declare active: CreationOptional<boolean>;
  declare lastSignInAt: Date | null;
  /** The authenticator secret, encrypted (server/auth/totp.ts); null until enrolled. */
  declare totpSecret: CreationOptional<string | null>;
  /** A secret shown for enrolment, kept until the first code confirms it. */
  declare totpPendingSecret: CreationOptional<string | null>;
  declare totpEnrolledAt: CreationOptional<Date | null>;
  /** The time step of the last code accepted: each code signs in once. */
  declare totpLastStep: CreationOptional<number | null>;
  /** The badge a shared station tablet scans to identify the person; unique. */
  declare badge: CreationOptional<string | null>;
  /** The short PIN typed after the badge, bcrypt-hashed as passwords are. */
  declare pinHash: CreationOptional<string | null>;
  declare pinSetAt: CreationOptional<Date | null>;
  declare language: CreationOptional<'en' | 'es'>;
  declare unitSystem: CreationOptional<'inch' | 'metric'>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    User.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
        name: { type: DataTypes.STRING(120), allowNull: false },
        role: { type: DataTypes.STRING(20), allowNull: false },
        passwordHash: { type: DataTypes.STRING(100), allowNull: false },
        tokenVersion: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        lastSignInAt: { type: DataTypes.DATE, allowNull: true },
        badge: { type: DataTypes.STRING(40), allowNull: true },
        pinHash: { type: DataTypes.STRING(100), allowNull: true },
        pinSetAt: { type: DataTypes.DATE, allowNull: true },
        language: { type: DataTypes.STRING(5), allowNull: false, defaultValue: 'en' },
        unitSystem: { type: DataTypes.STRING(6), allowNull: false, defaultValue: 'inch' },
        totpSecret: { type: DataTypes.STRING(200), allowNull: true, defaultValue: null },
        totpPendingSecret: { type: DataTypes.STRING(200), allowNull: true, defaultValue: null },
        totpEnrolledAt: { type: DataTypes.DATE, allowNull: true, defaultValue: null },
        totpLastStep: { type: DataTypes.BIGINT, allowNull: true, defaultValue: null },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'users', underscored: true },
    );
  }
}
