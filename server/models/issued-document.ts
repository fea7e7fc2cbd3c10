import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

export type DocumentKind = 'build_record' | 'certificate' | 'packing_slip';

/** A document issued at release: the content it is drawn from and the audit event that logged it. */
export class IssuedDocument extends Model<InferAttributes<IssuedDocument>, InferCreationAttributes<IssuedDocument>> {
  declare id: CreationOptional<number>;
  declare kind: DocumentKind;
  declare unitItemId: number;
  declare shipmentId: number;
  declare documentNumber: string;
  declare content: unknown;
  declare contentHash: string;
  declare auditEventId: number;
  declare issuedById: number | null;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    IssuedDocument.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        kind: { type: DataTypes.STRING(20), allowNull: false },
        unitItemId: { type: DataTypes.INTEGER, allowNull: false },
        shipmentId: { type: DataTypes.INTEGER, allowNull: false },
        documentNumber: { type: DataTypes.STRING(60), allowNull: false },
        content: { type: DataTypes.JSONB, allowNull: false },
        contentHash: { type: DataTypes.CHAR(64), allowNull: false },
        // bigint, read back as a number (ids stay far below 2^53)
        auditEventId: {
          type: DataTypes.BIGINT,
          allowNull: false,
          get() {
            return Number(this.getDataValue('auditEventId'));
          },
        },
        issuedById: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'issued_documents', underscored: true, updatedAt: false },
    );
  }
}
