import { QueryTypes, type Sequelize } from 'sequelize';
import type { z } from 'zod';
import { can } from '../../../shared/permissions.js';
import type { Role } from '../../../shared/roles.js';
import type { Paged } from '../../../shared/schemas/common.js';
import {
  TASK_KIND_LABELS,
  type closeCaBody,
  type taskBody,
  type taskDoneBody,
  type TaskJson,
  type TaskListQuery,
  type verifyBody,
} from '../../../shared/schemas/corrective-action.js';
import { recordAudit, type Ctx } from '../../audit.js';
import { AppError, conflict, forbidden, invalid, notFound } from '../../errors.js';
import { enqueueMail, quoted } from '../../mail/messages.js';
import { CorrectiveAction, CorrectiveActionMember, CorrectiveActionTask, User } from '../../models/index.js';
import { plantToday } from '../plant.js';
import { signWithPassword } from '../signatures.js';
import { namesOf } from '../warranty/people.js';
import { caDetail, closeBlockers, presentTask } from './detail.js';
import { caLink, lockCa } from './records.js';

/**
 * A corrective action's actions (corrective and preventive, each with an owner and a due date),
 * the check of effectiveness once they are done and its day has come, and the closure quality
 * signs. Every one of these locks the corrective action's row first, so an action added and a
 * closure signed at the same moment take turns: a closure never commits over an open action.
 */

export async function addTask(sequelize: Sequelize, ctx: Ctx, number: string, body: z.output<typeof taskBody>) {
  await sequelize.transaction(async (transaction) => {
    const ca = await lockCa(number, transaction);
    const owner = await User.findOne({ where: { id: body.ownerId, active: true }, transaction });
    if (!owner) throw invalid('Choose someone who works here now.', { ownerId: 'Unknown or inactive person.' });
    const today = await plantToday(transaction);
    if (body.dueOn < today) {
      throw invalid(`The due date cannot be before today (${today} at the plant).`, { dueOn: `Not before ${today}.` });
    }
    const task = await CorrectiveActionTask.create(
      {
        correctiveActionId: ca.id,
        kind: body.kind,
        description: body.description,
        ownerId: owner.id,
        dueOn: body.dueOn,
        doneAt: null,
        doneById: null,
        doneNote: null,
        createdById: ctx.actor!.id,
      },
      { transaction },
    );
    // an action added after a check of effectiveness asks for a new check
    if (ca.verifiedAt) {
      await ca.update(
        { verifiedEffective: null, verificationNote: null, verifiedById: null, verifiedAt: null },
        { transaction },
      );
    }
    await recordAudit(ctx, transaction, {
      action: 'corrective_action.action_added',
      entity: 'corrective_action',
      entityId: number,
      after: { action: task.id, kind: body.kind, description: body.description, owner: owner.name, dueOn: body.dueOn },
    });
    await enqueueMail(transaction, [
      {
        to: owner.email,
        subject: `${number}: an action for you, due ${body.dueOn}`,
        text: [
          `${ctx.actor?.name ?? 'Quality'} gave you an action in corrective action ${number}, "${ca.title}".`,
          '',
          `${TASK_KIND_LABELS[body.kind]}, due ${body.dueOn}:`,
          quoted(body.description),
          '',
          `Mark it done there when it is: ${caLink(number)}`,
          '',
          '— Coretrail',
        ].join('\n'),
        reason: 'corrective_action.action_added',
      },
    ]);
  });
  return caDetail(sequelize, number);
}

/** The owner marks an action done; a quality engineer may do so for them. */
export async function completeTask(
  sequelize: Sequelize,
  ctx: Ctx,
  number: string,
  id: number,
  body: z.output<typeof taskDoneBody>,
) {
  await sequelize.transaction(async (transaction) => {
    const ca = await lockCa(number, transaction);
    const task = await CorrectiveActionTask.findOne({
      where: { id, correctiveActionId: ca.id },
      transaction,
      lock: transaction.LOCK.UPDATE,
    });
    if (!task) throw notFound(`Action ${id} of ${number}`);
    if (task.ownerId !== ctx.actor!.id && !can(ctx.actor!.role as Role, 'corrective-actions.manage')) {
      throw forbidden('Only the action’s owner or a quality engineer can mark it done.');
    }
    if (task.doneAt) throw conflict(`That action was already marked done.`, { reason: 'done' });
    await task.update({ doneAt: new Date(), doneById: ctx.actor!.id, doneNote: body.note }, { transaction });
    await recordAudit(ctx, transaction, {
      action: 'corrective_action.action_done',
      entity: 'corrective_action',
      entityId: number,
      before: { action: id, done: false },
      after: { action: id, done: true, note: body.note },
    });
  });
  return caDetail(sequelize, number);
}

export async function verifyCa(sequelize: Sequelize, ctx: Ctx, number: string, body: z.output<typeof verifyBody>) {
  await sequelize.transaction(async (transaction) => {
    const ca = await lockCa(number, transaction);
    const tasks = await CorrectiveActionTask.findAll({ where: { correctiveActionId: ca.id }, transaction });
    const today = await plantToday(transaction);
    if (!tasks.length || tasks.some((t) => !t.doneAt)) {
      throw conflict('Effectiveness is checked once every action is done.', { reason: 'actions_open' });
    }
    if (!ca.verificationDueOn) {
      throw conflict('Set the day effectiveness is to be checked first.', { reason: 'no_verification_day' });
    }
    if (ca.verificationDueOn > today) {
      throw conflict(`Effectiveness is checked on or after ${ca.verificationDueOn}, not before.`, {
        reason: 'too_early',
      });
    }
    const before = { effective: ca.verifiedEffective, note: ca.verificationNote };
    await ca.update(
      {
        verifiedEffective: body.effective,
        verificationNote: body.note,
        verifiedById: ctx.actor!.id,
        verifiedAt: new Date(),
      },
      { transaction },
    );
    await recordAudit(ctx, transaction, {
      action: 'corrective_action.verified',
      entity: 'corrective_action',
      entityId: number,
      before,
      after: { effective: body.effective, note: body.note },
    });
  });
  return caDetail(sequelize, number);
}

export async function closeCa(sequelize: Sequelize, ctx: Ctx, number: string, body: z.output<typeof closeCaBody>) {
  await sequelize.transaction(async (transaction) => {
    const ca = await lockCa(number, transaction);
    const tasks = await CorrectiveActionTask.findAll({ where: { correctiveActionId: ca.id }, transaction });
    const blockers = closeBlockers(ca, tasks, await plantToday(transaction));
    if (blockers.length) {
      throw new AppError('not_closable', `${number} cannot close yet: ${blockers.join(' ')}`, undefined, {
        reason: 'not_closable',
        blockers,
      });
    }
    const { user } = await signWithPassword(ctx, transaction, {
      entity: 'corrective_action',
      entityId: number,
      meaning: `Closed corrective action ${number}`,
      reason: body.reason,
      password: body.password,
      refused: 'the corrective action was not closed.',
    });
    await ca.update({ state: 'closed', closedAt: new Date(), closedById: user.id }, { transaction });
    await recordAudit(ctx, transaction, {
      action: 'corrective_action.closed',
      entity: 'corrective_action',
      entityId: number,
      before: { state: 'open' },
      after: { state: 'closed', reason: body.reason, signedBy: user.name },
    });
    const team = await CorrectiveActionMember.findAll({
      where: { correctiveActionId: ca.id, removedAt: null },
      transaction,
    });
    const people = team.length
      ? await User.findAll({ where: { id: team.map((m) => m.userId), active: true }, transaction })
      : [];
    await enqueueMail(
      transaction,
      people.map((p) => ({
        to: p.email,
        subject: `Corrective action ${number} closed`,
        text: [
          `${user.name} closed corrective action ${number}, "${ca.title}", with this reason:`,
          quoted(body.reason),
          '',
          caLink(number),
          '',
          '— Coretrail',
        ].join('\n'),
        reason: 'corrective_action.closed',
      })),
    );
  });
  return caDetail(sequelize, number);
}

/** Actions across corrective actions: the caller's own, or everyone's; open ones past due when asked. */
export async function listTasks(sequelize: Sequelize, ctx: Ctx, q: TaskListQuery): Promise<Paged<TaskJson>> {
  const today = await plantToday();
  const where = ["ca.state = 'open'"];
  if (q.owner === 'me') where.push('t.owner_id = :me');
  if (q.overdue === 'true') where.push('t.done_at IS NULL AND t.due_on < CAST(:today AS date)');
  if (q.overdue === 'false') where.push('t.done_at IS NULL AND t.due_on >= CAST(:today AS date)');
  const sql = `FROM corrective_action_tasks t JOIN corrective_actions ca ON ca.id = t.corrective_action_id
    WHERE ${where.join(' AND ')}`;
  const replacements = { me: ctx.actor!.id, today, limit: q.pageSize, offset: (q.page - 1) * q.pageSize };
  const [ids, [count]] = await Promise.all([
    sequelize.query<{ id: number }>(`SELECT t.id ${sql} ORDER BY t.due_on, t.id LIMIT :limit OFFSET :offset`, {
      type: QueryTypes.SELECT,
      replacements,
    }),
    sequelize.query<{ n: number }>(`SELECT count(*)::int AS n ${sql}`, { type: QueryTypes.SELECT, replacements }),
  ]);
  const tasks = ids.length
    ? await CorrectiveActionTask.findAll({
        where: { id: ids.map((r) => r.id) },
        order: [
          ['dueOn', 'ASC'],
          ['id', 'ASC'],
        ],
      })
    : [];
  const cas = tasks.length
    ? await CorrectiveAction.findAll({ where: { id: [...new Set(tasks.map((t) => t.correctiveActionId))] } })
    : [];
  const name = await namesOf(tasks.flatMap((t) => [t.ownerId, t.doneById]));
  const caById = new Map(cas.map((c) => [c.id, c]));
  return {
    rows: tasks.map((t) => presentTask(t, caById.get(t.correctiveActionId)!, name, today)),
    total: count?.n ?? 0,
    page: q.page,
    pageSize: q.pageSize,
  };
}
