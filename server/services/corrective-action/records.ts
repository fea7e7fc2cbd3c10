import { Op, QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import type { z } from 'zod';
import type {
  addSourceBody,
  containmentLinkBody,
  evidenceBody,
  openCaBody,
  teamBody,
  updateCaBody,
} from '../../../shared/schemas/corrective-action.js';
import type { PersonOption } from '../../../shared/schemas/corrective-action.js';
import { recordAudit, type Ctx } from '../../audit.js';
import { conflict, invalid, notFound } from '../../errors.js';
import { appLink } from '../../mail/links.js';
import { enqueueMail, quoted } from '../../mail/messages.js';
import {
  CorrectiveAction,
  CorrectiveActionContainment,
  CorrectiveActionMember,
  CorrectiveActionSource,
  FieldAction,
  Nonconformance,
  User,
  WarrantyClaim,
} from '../../models/index.js';
import { claimUploads } from '../attachments.js';
import { caDetail } from './detail.js';

/**
 * Opening and keeping a corrective action: from one or many NCRs and claims, its team, its record
 * in the plant's own words (problem, containment, root cause), links to the holds and field actions
 * that contain the problem, and evidence (photos or PDFs through the upload path). Each change is
 * one transaction with its audit event; nothing is deleted (someone leaving the team is ended).
 */

export const caLink = (number: string) => appLink(`/corrective-actions/${number}`);

async function nextNumber(sequelize: Sequelize, transaction: Transaction) {
  const [row] = await sequelize.query<{ n: string }>("SELECT nextval('corrective_action_number_seq')::text AS n", {
    type: QueryTypes.SELECT,
    transaction,
  });
  return `CA-${new Date().getUTCFullYear()}-${row!.n.padStart(5, '0')}`;
}

/** The corrective action, its row locked: every change to it, its actions and its closure take turns. */
export async function lockCa(number: string, transaction: Transaction, { open = true } = {}) {
  const ca = await CorrectiveAction.findOne({ where: { number }, transaction, lock: transaction.LOCK.UPDATE });
  if (!ca) throw notFound(`Corrective action ${number}`);
  if (open && ca.state !== 'open') {
    throw conflict(`${number} is closed: it is kept as it was signed.`, { reason: 'closed' });
  }
  return ca;
}

async function ncrsByNumber(numbers: string[], transaction: Transaction, field: string) {
  const rows = numbers.length
    ? await Nonconformance.findAll({ where: { number: { [Op.in]: numbers } }, transaction })
    : [];
  const missing = numbers.filter((n) => !rows.some((r) => r.number === n));
  if (missing.length) throw invalid(`No NCR ${missing.join(', ')}.`, { [field]: `Unknown NCR ${missing[0]}.` });
  return rows;
}

async function claimsByNumber(numbers: string[], transaction: Transaction, field: string) {
  const rows = numbers.length
    ? await WarrantyClaim.findAll({ where: { number: { [Op.in]: numbers } }, transaction })
    : [];
  const missing = numbers.filter((n) => !rows.some((r) => r.number === n));
  if (missing.length) throw invalid(`No claim ${missing.join(', ')}.`, { [field]: `Unknown claim ${missing[0]}.` });
  return rows;
}

async function activePeople(ids: number[], transaction: Transaction, field: string) {
  const unique = [...new Set(ids)];
  const rows = unique.length
    ? await User.findAll({ where: { id: { [Op.in]: unique }, active: true }, transaction })
    : [];
  if (rows.length !== unique.length)
    throw invalid('Choose people who work here now.', { [field]: 'Unknown or inactive person.' });
  return rows;
}

type Open = z.output<typeof openCaBody>;

export async function openCa(sequelize: Sequelize, ctx: Ctx, body: Open) {
  const number = await sequelize.transaction(async (transaction) => {
    const ncrs = await ncrsByNumber([...new Set(body.ncrs)], transaction, 'ncrs');
    const claims = await claimsByNumber([...new Set(body.claims)], transaction, 'claims');
    const people = await activePeople(
      body.team.map((m) => m.userId),
      transaction,
      'team',
    );
    const number = await nextNumber(sequelize, transaction);
    const ca = await CorrectiveAction.create(
      {
        number,
        title: body.title,
        problem: body.problem,
        verificationDueOn: null,
        verificationNote: null,
        verifiedEffective: null,
        verifiedById: null,
        verifiedAt: null,
        openedById: ctx.actor!.id,
        closedById: null,
        closedAt: null,
      },
      { transaction },
    );
    for (const n of ncrs) {
      await CorrectiveActionSource.create(
        { correctiveActionId: ca.id, nonconformanceId: n.id, warrantyClaimId: null, addedById: ctx.actor!.id },
        { transaction },
      );
    }
    for (const c of claims) {
      await CorrectiveActionSource.create(
        { correctiveActionId: ca.id, nonconformanceId: null, warrantyClaimId: c.id, addedById: ctx.actor!.id },
        { transaction },
      );
    }
    const seen = new Set<number>();
    for (const m of body.team) {
      if (seen.has(m.userId)) continue;
      seen.add(m.userId);
      await CorrectiveActionMember.create(
        { correctiveActionId: ca.id, userId: m.userId, teamRole: m.role, addedById: ctx.actor!.id, removedAt: null },
        { transaction },
      );
    }
    await recordAudit(ctx, transaction, {
      action: 'corrective_action.opened',
      entity: 'corrective_action',
      entityId: number,
      after: {
        title: body.title,
        problem: body.problem,
        ncrs: ncrs.map((n) => n.number),
        claims: claims.map((c) => c.number),
        team: body.team,
      },
    });
    await enqueueMail(
      transaction,
      people.map((p) => ({
        to: p.email,
        subject: `Corrective action ${number}: you are on the team`,
        text: [
          `${ctx.actor?.name ?? 'Quality'} opened corrective action ${number}, "${body.title}", and put you on its team.`,
          `It answers ${[...ncrs.map((n) => n.number), ...claims.map((c) => c.number)].join(', ')}.`,
          ...(body.problem ? ['', 'The problem:', quoted(body.problem)] : []),
          '',
          `Open it: ${caLink(number)}`,
          '',
          '— Coretrail',
        ].join('\n'),
        reason: 'corrective_action.opened',
      })),
    );
    return number;
  });
  return caDetail(sequelize, number);
}

type Update = z.output<typeof updateCaBody>;

export async function updateCa(sequelize: Sequelize, ctx: Ctx, number: string, body: Update) {
  await sequelize.transaction(async (transaction) => {
    const ca = await lockCa(number, transaction);
    const keys = Object.keys(body) as (keyof Update)[];
    const before = Object.fromEntries(keys.map((k) => [k, ca.get(k)]));
    const changes: Partial<Update> = { ...body };
    if (body.verificationDueOn !== undefined && body.verificationDueOn !== ca.verificationDueOn) {
      // a new day for the check asks for a new check
      Object.assign(changes, { verifiedEffective: null, verificationNote: null, verifiedById: null, verifiedAt: null });
    }
    await ca.update(changes, { transaction });
    await recordAudit(ctx, transaction, {
      action: 'corrective_action.updated',
      entity: 'corrective_action',
      entityId: number,
      before,
      after: body,
    });
  });
  return caDetail(sequelize, number);
}

export async function addSource(sequelize: Sequelize, ctx: Ctx, number: string, body: z.output<typeof addSourceBody>) {
  await sequelize.transaction(async (transaction) => {
    const ca = await lockCa(number, transaction);
    const [ncr] = body.ncr ? await ncrsByNumber([body.ncr], transaction, 'ncr') : [];
    const [claim] = body.claim ? await claimsByNumber([body.claim], transaction, 'claim') : [];
    await CorrectiveActionSource.create(
      {
        correctiveActionId: ca.id,
        nonconformanceId: ncr?.id ?? null,
        warrantyClaimId: claim?.id ?? null,
        addedById: ctx.actor!.id,
      },
      { transaction },
    );
    await recordAudit(ctx, transaction, {
      action: 'corrective_action.source_added',
      entity: 'corrective_action',
      entityId: number,
      after: { ncr: body.ncr ?? null, claim: body.claim ?? null },
    });
  });
  return caDetail(sequelize, number);
}

export async function setTeam(sequelize: Sequelize, ctx: Ctx, number: string, body: z.output<typeof teamBody>) {
  await sequelize.transaction(async (transaction) => {
    const ca = await lockCa(number, transaction);
    await activePeople(
      body.members.map((m) => m.userId),
      transaction,
      'members',
    );
    const current = await CorrectiveActionMember.findAll({
      where: { correctiveActionId: ca.id, removedAt: null },
      transaction,
    });
    const wanted = new Map(body.members.map((m) => [m.userId, m.role]));
    const before = current.map((m) => ({ userId: m.userId, role: m.teamRole }));
    for (const m of current) {
      // gone, or staying with another part in the team: the old row is ended, never changed
      if (!wanted.has(m.userId) || wanted.get(m.userId) !== m.teamRole) {
        await m.update({ removedAt: new Date() }, { transaction });
      }
    }
    for (const [userId, role] of wanted) {
      if (current.some((m) => m.userId === userId && m.teamRole === role)) continue;
      await CorrectiveActionMember.create(
        { correctiveActionId: ca.id, userId, teamRole: role, addedById: ctx.actor!.id, removedAt: null },
        { transaction },
      );
    }
    await recordAudit(ctx, transaction, {
      action: 'corrective_action.team_set',
      entity: 'corrective_action',
      entityId: number,
      before,
      after: body.members,
    });
  });
  return caDetail(sequelize, number);
}

export async function linkContainment(
  sequelize: Sequelize,
  ctx: Ctx,
  number: string,
  body: z.output<typeof containmentLinkBody>,
) {
  await sequelize.transaction(async (transaction) => {
    const ca = await lockCa(number, transaction);
    const [ncr] = body.ncr ? await ncrsByNumber([body.ncr], transaction, 'ncr') : [];
    const fa = body.fieldAction
      ? await FieldAction.findOne({ where: { number: body.fieldAction }, transaction })
      : null;
    if (body.fieldAction && !fa)
      throw invalid(`No field action ${body.fieldAction}.`, { fieldAction: 'Unknown field action.' });
    await CorrectiveActionContainment.create(
      {
        correctiveActionId: ca.id,
        nonconformanceId: ncr?.id ?? null,
        fieldActionId: fa?.id ?? null,
        note: body.note,
        addedById: ctx.actor!.id,
      },
      { transaction },
    );
    await recordAudit(ctx, transaction, {
      action: 'corrective_action.containment_linked',
      entity: 'corrective_action',
      entityId: number,
      after: { hold: body.ncr ?? null, fieldAction: body.fieldAction ?? null, note: body.note },
    });
  });
  return caDetail(sequelize, number);
}

export async function attachEvidence(
  sequelize: Sequelize,
  ctx: Ctx,
  number: string,
  body: z.output<typeof evidenceBody>,
) {
  await sequelize.transaction(async (transaction) => {
    await lockCa(number, transaction);
    await claimUploads(ctx, transaction, body.attachmentIds, 'corrective_action', number, {
      documents: true,
      field: 'attachmentIds',
    });
    await recordAudit(ctx, transaction, {
      action: 'corrective_action.evidence_attached',
      entity: 'corrective_action',
      entityId: number,
      after: { attachmentIds: body.attachmentIds },
    });
  });
  return caDetail(sequelize, number);
}

/** Everyone who may sit on a team or own an action: active people, by name. */
export async function peopleOptions(): Promise<PersonOption[]> {
  const rows = await User.findAll({
    where: { active: true },
    attributes: ['id', 'name', 'role'],
    order: [['name', 'ASC']],
  });
  return rows.map((u) => ({ id: u.id, name: u.name, role: u.role }));
}
