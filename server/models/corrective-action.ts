import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

/**
 * A corrective action (an 8D-style problem record) answering one or many NCRs and claims: team,
 * problem, containment, root cause with evidence, actions, verification of effectiveness and a
 * closure signed by quality.
 */
export class CorrectiveAction extends Model<
  InferAttributes<CorrectiveAction>,
  InferCreationAttributes<CorrectiveAction>
> {
  declare id: CreationOptional<number>;
  declare number: string;
  declare title: string;
  declare state: CreationOptional<'open' | 'closed'>;
  declare problem: CreationOptional<string>;
  declare containment: CreationOptional<string>;
  declare rootCause: CreationOptional<string>;
  /** `YYYY-MM-DD`: effectiveness is checked on or after this plant day. */
  declare verificationDueOn: string | null;
  declare verificationNote: string | null;
  declare verifiedEffective: boolean | null;
  declare verifiedById: number | null;
  declare verifiedAt: Date | null;
  declare openedById: number;
  declare closedById: number | null;
  declare closedAt: Date | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    CorrectiveAction.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        number: { type: DataTypes.STRING(20), allowNull: false, unique: true },
        title: { type: DataTypes.STRING(160), allowNull: false },
        state: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'open' },
        problem: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        containment: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        rootCause: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        verificationDueOn: { type: DataTypes.DATEONLY, allowNull: true },
        verificationNote: { type: DataTypes.TEXT, allowNull: true },
        verifiedEffective: { type: DataTypes.BOOLEAN, allowNull: true },
        verifiedById: { type: DataTypes.INTEGER, allowNull: true },
        verifiedAt: { type: DataTypes.DATE, allowNull: true },
        openedById: { type: DataTypes.INTEGER, allowNull: false },
        closedById: { type: DataTypes.INTEGER, allowNull: true },
        closedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'corrective_actions', underscored: true },
    );
  }
}

/** An NCR or a claim a corrective action answers (exactly one of the two). */
export class CorrectiveActionSource extends Model<
  InferAttributes<CorrectiveActionSource>,
  InferCreationAttributes<CorrectiveActionSource>
> {
  declare id: CreationOptional<number>;
  declare correctiveActionId: number;
  declare nonconformanceId: number | null;
  declare warrantyClaimId: number | null;
  declare addedById: number;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    CorrectiveActionSource.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        correctiveActionId: { type: DataTypes.INTEGER, allowNull: false },
        nonconformanceId: { type: DataTypes.INTEGER, allowNull: true },
        warrantyClaimId: { type: DataTypes.INTEGER, allowNull: true },
        addedById: { type: DataTypes.INTEGER, allowNull: false },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'corrective_action_sources', underscored: true, updatedAt: false },
    );
  }
}

/** A team member; leaving the team ends the row (`removedAt`), it is not deleted. */
export class CorrectiveActionMember extends Model<
  InferAttributes<CorrectiveActionMember>,
  InferCreationAttributes<CorrectiveActionMember>
> {
  declare id: CreationOptional<number>;
  declare correctiveActionId: number;
  declare userId: number;
  declare teamRole: CreationOptional<string>;
  declare addedById: number;
  declare removedAt: Date | null;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    CorrectiveActionMember.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        correctiveActionId: { type: DataTypes.INTEGER, allowNull: false },
        userId: { type: DataTypes.INTEGER, allowNull: false },
        teamRole: { type: DataTypes.STRING(80), allowNull: false, defaultValue: '' },
        addedById: { type: DataTypes.INTEGER, allowNull: false },
        removedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'corrective_action_members', underscored: true, updatedAt: false },
    );
  }
}

/** A hold (the NCR holding a part or lot) or a field action linked as containment. */
export class CorrectiveActionContainment extends Model<
  InferAttributes<CorrectiveActionContainment>,
  InferCreationAttributes<CorrectiveActionContainment>
> {
  declare id: CreationOptional<number>;
  declare correctiveActionId: number;
  declare nonconformanceId: number | null;
  declare fieldActionId: number | null;
  declare note: CreationOptional<string>;
  declare addedById: number;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    CorrectiveActionContainment.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        correctiveActionId: { type: DataTypes.INTEGER, allowNull: false },
        nonconformanceId: { type: DataTypes.INTEGER, allowNull: true },
        fieldActionId: { type: DataTypes.INTEGER, allowNull: true },
        note: { type: DataTypes.STRING(500), allowNull: false, defaultValue: '' },
        addedById: { type: DataTypes.INTEGER, allowNull: false },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'corrective_action_containment', underscored: true, updatedAt: false },
    );
  }
}

export type TaskKind = 'corrective' | 'preventive';

/** A corrective or preventive action with its owner and due date. */
export class CorrectiveActionTask extends Model<
  InferAttributes<CorrectiveActionTask>,
  InferCreationAttributes<CorrectiveActionTask>
> {
  declare id: CreationOptional<number>;
  declare correctiveActionId: number;
  declare kind: TaskKind;
  declare description: string;
  declare ownerId: number;
  /** `YYYY-MM-DD`, the plant's calendar. */
  declare dueOn: string;
  declare doneAt: Date | null;
  declare doneById: number | null;
  declare doneNote: string | null;
  declare createdById: number;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    CorrectiveActionTask.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        correctiveActionId: { type: DataTypes.INTEGER, allowNull: false },
        kind: { type: DataTypes.STRING(12), allowNull: false },
        description: { type: DataTypes.TEXT, allowNull: false },
        ownerId: { type: DataTypes.INTEGER, allowNull: false },
        dueOn: { type: DataTypes.DATEONLY, allowNull: false },
        doneAt: { type: DataTypes.DATE, allowNull: true },
        doneById: { type: DataTypes.INTEGER, allowNull: true },
        doneNote: { type: DataTypes.TEXT, allowNull: true },
        createdById: { type: DataTypes.INTEGER, allowNull: false },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'corrective_action_tasks', underscored: true },
    );
  }
}
