import { Op, QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { can } from '../../shared/permissions.js';
import type { Role } from '../../shared/roles.js';
import {
  DISPOSITION_LABELS,
  NCR_STATE_LABELS,
  OPEN_NCR_STATES,
  type DispositionBody,
  type NcrAction,
  type NcrDetail,
  type NcrListQuery,
  type NcrRow,
  type NcrState,
  type RaiseNcrBody,
  type Severity,
} from '../../shared/schemas/ncr.js';
import type { HoldJson } from '../../shared/schemas/results.js';
import { recordAudit, type Ctx } from '../audit.js';
import { conflict, invalid, notFound } from '../errors.js';
import { appLink } from '../mail/links.js';
import { enqueueMail, quoted, type Mail } from '../mail/messages.js';
import {
  DefectCode,
  Item,
  ItemLink,
  Nonconformance,
  NonconformanceTransition,
  PartLot,
  Signature,
  Stage,
  StageResult,
  Station,
  Supplier,
  User,
} from '../models/index.js';
import { attachmentsOf, claimUploads } from './attachments.js';
import { openFieldActions } from './field-actions.js';
import { findBySerial, presentItem, routeOfItem } from './items.js';
import { ncrTimeline } from './ncr-timeline.js';
import { notifyIfReleasable } from './release.js';
import { presentSignature, signWithPassword } from './signatures.js';
import { lockUnitsReachedBy, type LockSubject } from './unit-locks.js';

export { NCR_STATE_LABELS, OPEN_NCR_STATES };

/**
 * The NCR workflow. raised → in_review → decided → closed, or voided when raised in error. Each
 * step records who, when and why (a transition row and an audit event, in one transaction);
 * dispositions are signed with the decider's password, and a use-as-is on a critical NCR needs a
 * second quality signer. While an NCR is open its item is held — except that a rework or repair
 * lets the item through the one stage it was sent back to.
 */

const ncrLink = (number: string) => appLink(`/ncrs/${number}`);

/** Open NCRs that stop an item being recorded at `stageId` (all open ones when no stage is given). */
export async function blockingNcrsOf(itemId: number, stageId?: number, transaction?: Transaction): Promise<HoldJson[]> {
  const rows = await Nonconformance.findAll({
    where: { itemId, state: { [Op.in]: OPEN_NCR_STATES } },
    order: [['id', 'ASC']],
    transaction,
  });
  return rows
    .filter(
      (n) =>
        !(
          stageId !== undefined &&
          n.state === 'decided' &&
          (n.disposition === 'rework' || n.disposition === 'repair') &&
          n.reworkStageId === stageId
        ),
    )
    .map((n) => ({ number: n.number, state: n.state, description: n.description }));
}

export const openNcrsOf = (itemId: number, transaction?: Transaction) => blockingNcrsOf(itemId, undefined, transaction);

/** NC-2026-00042: the year it was raised and a plant-wide running number. */
async function nextNumber(sequelize: Sequelize, transaction: Transaction) {
  const [row] = await sequelize.query<{ n: string }>("SELECT nextval('nonconformance_number_seq')::text AS n", {
    type: QueryTypes.SELECT,
    transaction,
  });
  return `NC-${new Date().getUTCFullYear()}-${row!.n.padStart(5, '0')}`;
}

export type FailingReading = NcrDetail['failing'][number];

async function installedIn(itemId: number, transaction: Transaction) {
  const link = await ItemLink.findOne({
    where: { childItemId: itemId, linkType: 'installed_in', removedAt: null },
    transaction,
  });
  return link?.parentItemId ?? null;
}

async function recipients(roles: Role[], transaction: Transaction) {
  return User.findAll({
    where: { role: { [Op.in]: roles }, active: true },
    attributes: ['email', 'name'],
    transaction,
  });
}

async function raisedMails(ncr: Nonconformance, serial: string, transaction: Transaction): Promise<Mail[]> {
  const roles: Role[] = ncr.severity === 'critical' ? ['quality', 'supervisor'] : ['quality'];
  const people = await recipients(roles, transaction);
  const text = [
    `${ncr.number} was raised on ${serial} (${ncr.severity}).`,
    '',
    'What was found:',
    quoted(ncr.description),
    '',
    ncr.itemId
      ? `The part is on hold until the NCR is decided. Open it: ${ncrLink(ncr.number)}`
      : `The lot cannot go into a unit until the NCR is decided. Open it: ${ncrLink(ncr.number)}`,
    '',
    '— Coretrail',
  ].join('\n');
  return people.map((p) => ({
    to: p.email,
    subject: `${ncr.severity === 'critical' ? 'Critical ' : ''}NCR ${ncr.number} raised on ${serial}`,
    text,
    reason: 'ncr.raised',
  }));
}

/**
 * Raises an NCR inside the caller's transaction (the failing result's, or a concern raised by hand),
 * with its first transition, an audit event and the messages to quality.
 */
export async function raiseNonconformance(
  sequelize: Sequelize,
  ctx: Ctx,
  transaction: Transaction,
  input: {
    itemId: number | null;
    /** What the NCR is about, in words: a serial, or "lot L-12 (Pistons, Valley Piston Works)". */
    itemSerial: string;
    partLotId?: number | null;
    itemStatusBefore: string | null;
    stageId: number | null;
    stageResultId: number | null;
    severity: Severity;
    defectCode: string | null;
    description: string;
    failing: FailingReading[];
    containment?: string;
    /** How it came to be raised, in words for the timeline (never a row number). */
    origin: string;
  },
): Promise<Nonconformance> {
  const defect = input.defectCode ? await DefectCode.findOne({ where: { code: input.defectCode }, transaction }) : null;
  const ncr = await Nonconformance.create(
    {
      number: await nextNumber(sequelize, transaction),
      itemId: input.itemId,
      partLotId: input.partLotId ?? null,
      stageResultId: input.stageResultId,
      stageId: input.stageId,
      defectCodeId: defect?.id ?? null,
      severity: input.severity,
      state: 'raised',
      description: input.description,
      failing: input.failing,
      containment: input.containment ?? '',
      disposition: null,
      dispositionReason: null,
      reworkStageId: null,
      raisedById: ctx.actor!.id,
      assigneeId: null,
      closedAt: null,
      itemStatusBefore: input.itemStatusBefore,
      decidedById: null,
      decidedAt: null,
    },
    { transaction },
  );
  await NonconformanceTransition.create(
    {
      nonconformanceId: ncr.id,
      fromState: null,
      toState: 'raised',
      actorId: ctx.actor!.id,
      reason: input.origin,
    },
    { transaction },
  );
  await recordAudit(ctx, transaction, {
    action: 'ncr.raised',
    entity: 'nonconformance',
    entityId: ncr.number,
    after: {
      item: input.itemSerial,
      severity: ncr.severity,
      defectCode: defect?.code ?? null,
      stageResultId: ncr.stageResultId,
      description: ncr.description,
      failing: input.failing,
    },
  });
  await enqueueMail(transaction, await raisedMails(ncr, input.itemSerial, transaction));
  // the units it reaches (already locked by the caller, so this takes nothing new): any that has
  // shipped gets a field action
  const units = await lockUnitsReachedBy(sequelize, subjectOf(ncr), transaction);
  await openFieldActions(sequelize, ctx, transaction, ncr, input.itemSerial, units);
  return ncr;
}

/** What an NCR is about, for the lock protocol: its part (or core, or unit), or its lot. */
export function subjectOf(ncr: Pick<Nonconformance, 'itemId' | 'partLotId'>): LockSubject {
  if (ncr.itemId) return { itemId: ncr.itemId };
  if (ncr.partLotId) return { lotId: ncr.partLotId };
  throw new Error('An NCR is about an item or a lot.');
}

async function activeDefect(code: string, transaction: Transaction) {
  const defect = await DefectCode.findOne({ where: { code: code.toUpperCase(), active: true }, transaction });
  if (!defect) throw invalid('Choose a defect code from the list.', { defectCode: `No defect code ${code}.` });
  return defect;
}

/** Anyone on the floor raising a concern about a part: it goes on hold at once. */
export async function raiseConcern(sequelize: Sequelize, ctx: Ctx, body: RaiseNcrBody): Promise<NcrDetail> {
  if (!body.serial) return raiseLotConcern(sequelize, ctx, body);
  const serial = body.serial;
  const number = await sequelize.transaction(async (transaction) => {
    const found = await findBySerial(serial, transaction);
    // the units it reaches first, as the release gate locks them: an NCR cannot slip past a release
    await lockUnitsReachedBy(sequelize, { itemId: found.id }, transaction);
    const item = (await Item.findByPk(found.id, { transaction, lock: transaction.LOCK.UPDATE }))!;
    if (item.status === 'scrapped') throw conflict(`${item.serial} has been scrapped: there is nothing left to hold.`);
    const defect = await activeDefect(body.defectCode, transaction);
    const holds = !['shipped'].includes(item.status);
    const ncr = await raiseNonconformance(sequelize, ctx, transaction, {
      itemId: item.id,
      itemSerial: item.serial,
      itemStatusBefore: item.status,
      stageId: item.currentStageId,
      stageResultId: null,
      severity: body.severity,
      defectCode: defect.code,
      description: body.description,
      failing: [],
      containment: body.containment,
      origin: 'Raised as a concern',
    });
    await claimUploads(ctx, transaction, body.photoIds, 'nonconformance', ncr.number);
    if (holds && item.status !== 'on_hold') {
      const before = { status: item.status };
      await item.update({ status: 'on_hold' }, { transaction });
      await recordAudit(ctx, transaction, {
        action: 'item.held',
        entity: 'item',
        entityId: item.serial,
        before,
        after: { status: 'on_hold', byNcr: ncr.number },
      });
    }
    return ncr.number;
  });
  return ncrDetail(number, ctx);
}

/** A concern about a purchased lot: no part is held, but the lot cannot go into a unit while it is open. */
async function raiseLotConcern(sequelize: Sequelize, ctx: Ctx, body: RaiseNcrBody): Promise<NcrDetail> {
  const number = await sequelize.transaction(async (transaction) => {
    const lots = await PartLot.findAll({
      where: {
        lotCode: body.lotCode!.toUpperCase(),
        ...(body.supplierId ? { supplierId: body.supplierId } : {}),
        ...(body.partNumber ? { partNumber: body.partNumber.toUpperCase() } : {}),
      },
      include: [{ model: Supplier, as: 'supplier' }],
      order: [['id', 'ASC']],
      transaction,
    });
    if (!lots.length) throw invalid(`No lot ${body.lotCode} is on record.`, { lotCode: 'Unknown lot code.' });
    if (lots.length > 1) {
      // a code alone does not name one lot: say which part numbers and suppliers share it
      const named = lots
        .map(
          (l) =>
            `part number ${l.partNumber} from ${(l as PartLot & { supplier?: Supplier }).supplier?.name ?? 'a supplier'}`,
        )
        .join('; ');
      const suppliers = new Set(lots.map((l) => l.supplierId));
      if (suppliers.size > 1) {
        throw invalid(
          `Lot code ${body.lotCode!.toUpperCase()} is on more than one lot (${named}): choose the supplier.`,
          {
            supplierId: 'Choose the supplier.',
          },
        );
      }
      throw invalid(
        `Lot code ${body.lotCode!.toUpperCase()} is on more than one part number (${named}): give the part number.`,
        { partNumber: `One of ${lots.map((l) => l.partNumber).join(', ')}.` },
      );
    }
    // every unit the lot went into, then the lot itself
    await lockUnitsReachedBy(sequelize, { lotId: lots[0]!.id }, transaction);
    await PartLot.findByPk(lots[0]!.id, { transaction, lock: transaction.LOCK.UPDATE });
    const lot = lots[0]!;
    const defect = await activeDefect(body.defectCode, transaction);
    const supplier = (lot as PartLot & { supplier?: Supplier }).supplier;
    const ncr = await raiseNonconformance(sequelize, ctx, transaction, {
      itemId: null,
      itemSerial: `lot ${lot.lotCode} (${lot.partKind.replace(/_/g, ' ')}, ${supplier?.name ?? 'supplier'})`,
      partLotId: lot.id,
      itemStatusBefore: null,
      stageId: null,
      stageResultId: null,
      severity: body.severity,
      defectCode: defect.code,
      description: body.description,
      failing: [],
      containment: body.containment,
      origin: 'Raised as a concern about the lot',
    });
    await claimUploads(ctx, transaction, body.photoIds, 'nonconformance', ncr.number);
    return ncr.number;
  });
  return ncrDetail(number, ctx);
}

// ——— reading ———

// only the serial can be empty (an NCR on a lot); the others keep a plain order, which lets the
// (state, created_at) index hand the newest rows over without sorting every NCR first
const SORT: Record<NcrListQuery['sort'], string> = {
  raised: 'n.created_at',
  number: 'n.number',
  severity: "array_position(ARRAY['critical','major','minor']::varchar[], n.severity)",
  state: "array_position(ARRAY['raised','in_review','decided','closed','voided']::varchar[], n.state)",
  serial: 'i.serial',
};

/** The NCR list's two statements for a query, with their replacements; the benchmark runs them too. */
export function ncrListSql(q: NcrListQuery, { all = false, me = 0 }: { all?: boolean; me?: number } = {}) {
  const where: string[] = [];
  const r: Record<string, unknown> = {};
  const add = (sql: string, key?: string, value?: unknown) => {
    where.push(sql);
    if (key) r[key] = value;
  };
  if (q.state === 'open') add(`n.state IN ('raised','in_review','decided')`);
  else if (q.state) add('n.state = :state', 'state', q.state);
  if (q.severity) add('n.severity = :severity', 'severity', q.severity);
  if (q.defect) add('d.code = :defect', 'defect', q.defect.toUpperCase());
  if (q.family) add('i.engine_family_id = :family', 'family', q.family);
  if (q.stage) add('s.code = :stage', 'stage', q.stage);
  if (q.olderThanDays !== undefined) add('n.created_at <= now() - make_interval(days => :age)', 'age', q.olderThanDays);
  if (q.awaiting === 'me') {
    // signed once by someone else, waiting for a second quality engineer
    add(`n.state = 'in_review' AND n.awaiting_second_signature AND n.decided_by_id <> :me`, 'me', me);
  }
  if (q.assignee === 'none') add('n.assignee_id IS NULL');
  else if (q.assignee) add('n.assignee_id = :assignee', 'assignee', q.assignee);
  if (q.q) {
    // serials match however they were typed: case, dashes and spaces do not matter
    where.push(
      "(n.number ILIKE :q OR i.serial ILIKE :q OR replace(i.serial, '-', '') ILIKE :qc OR pl.lot_code ILIKE :q OR n.description ILIKE :q)",
    );
    r.q = `%${q.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    r.qc = `%${q.q.replace(/[^A-Za-z0-9]/g, '') || '-'}%`;
  }
  const filter = where.length ? `WHERE ${where.join(' AND ')}` : '';
  const from = `FROM nonconformances n
    LEFT JOIN items i ON i.id = n.item_id
    LEFT JOIN engine_families f ON f.id = i.engine_family_id
    LEFT JOIN stages s ON s.id = n.stage_id
    LEFT JOIN defect_codes d ON d.id = n.defect_code_id
    LEFT JOIN part_lots pl ON pl.id = n.part_lot_id
    JOIN users ru ON ru.id = n.raised_by_id
    LEFT JOIN users au ON au.id = n.assignee_id`;
  const dir = q.dir === 'asc' ? 'ASC' : 'DESC';
  return {
    rows: `SELECT n.number, n.state, n.severity, pl.lot_code AS "lotCode",
              n.awaiting_second_signature AS "awaitingSecondSignature", n.assignee_id AS "assigneeId",
              i.serial, i.kind AS "itemKind", f.code AS "familyCode",
              s.code AS "stageCode", s.name AS "stageName", d.code AS "defectCode", n.description,
              n.disposition, ru.name AS "raisedBy", au.name AS assignee,
              to_char(n.created_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS"Z"') AS "raisedAt",
              (extract(epoch FROM now() - n.created_at) / 86400)::int AS "ageDays"
         ${from} ${filter} ORDER BY ${SORT[q.sort]} ${dir}${q.sort === 'serial' ? ' NULLS LAST' : ''}, n.id ${dir}
         ${all ? '' : 'LIMIT :limit OFFSET :offset'}`,
    count: `SELECT count(*)::int AS n ${from} ${filter}`,
    replacements: { ...r, limit: q.pageSize, offset: (q.page - 1) * q.pageSize },
  };
}

/** The NCR list: filtered, sorted and paged in SQL. */
export async function listNcrs(sequelize: Sequelize, q: NcrListQuery, { all = false, me = 0 } = {}) {
  const sql = ncrListSql(q, { all, me });
  const [rows, [count]] = await Promise.all([
    sequelize.query<NcrRow>(sql.rows, { type: QueryTypes.SELECT, replacements: sql.replacements }),
    sequelize.query<{ n: number }>(sql.count, { type: QueryTypes.SELECT, replacements: sql.replacements }),
  ]);
  return { rows, total: count?.n ?? 0, page: q.page, pageSize: q.pageSize };
}

async function findNcr(number: string, transaction?: Transaction, lock = false) {
  const ncr = await Nonconformance.findOne({
    where: { number },
    transaction,
    ...(lock && transaction ? { lock: transaction.LOCK.UPDATE } : {}),
  });
  if (!ncr) throw notFound(`NCR ${number}`);
  return ncr;
}

/** The steps open to this person now. */
export function allowedActions(ncr: Nonconformance, role: Role | undefined, userId?: number): NcrAction[] {
  if (!role || !can(role, 'ncr.disposition')) return [];
  switch (ncr.state as NcrState) {
    case 'raised':
      return ['review', 'void'];
    case 'in_review':
      if (ncr.awaitingSecondSignature) return ncr.decidedById === userId ? ['void'] : ['countersign', 'void'];
      return ['disposition', 'void'];
    case 'decided':
      return ['close'];
    default:
      return [];
  }
}

export async function ncrDetail(number: string, ctx: Ctx): Promise<NcrDetail> {
  const ncr = await findNcr(number);
  const lot = ncr.partLotId
    ? await PartLot.findByPk(ncr.partLotId, { include: [{ model: Supplier, as: 'supplier' }] })
    : null;
  const [transitions, signatures, ownPhotos, resultPhotos, item, stage, reworkStage, defect, origin] =
    await Promise.all([
      NonconformanceTransition.findAll({ where: { nonconformanceId: ncr.id }, order: [['id', 'ASC']] }),
      Signature.findAll({ where: { entity: 'nonconformance', entityId: ncr.number }, order: [['id', 'ASC']] }),
      attachmentsOf('nonconformance', ncr.number),
      // the evidence taken with the failing result belongs to the NCR too
      ncr.stageResultId ? attachmentsOf('stage_result', ncr.stageResultId) : [],
      ncr.itemId ? Item.findByPk(ncr.itemId) : null,
      ncr.stageId ? Stage.findByPk(ncr.stageId) : null,
      ncr.reworkStageId ? Stage.findByPk(ncr.reworkStageId) : null,
      ncr.defectCodeId ? DefectCode.findByPk(ncr.defectCodeId) : null,
      ncr.stageResultId
        ? StageResult.findByPk(ncr.stageResultId, {
            include: [
              { model: Stage, as: 'stage', attributes: ['name'] },
              { model: Station, as: 'station', attributes: ['name'] },
              { model: User, as: 'operator', attributes: ['name'] },
            ],
          })
        : null,
    ]);
  const userIds = [
    ...new Set([ncr.raisedById, ncr.assigneeId, ncr.decidedById, ...transitions.map((t) => t.actorId)]),
  ].filter((x): x is number => x !== null);
  const users = new Map(
    (await User.findAll({ where: { id: { [Op.in]: userIds } }, attributes: ['id', 'name'] })).map((u) => [
      u.id,
      u.name,
    ]),
  );
  const presented = item ? await presentItem(item) : null;
  const o = origin as (StageResult & { stage?: Stage; station?: Station | null; operator?: User }) | null;
  const timeline = ncrTimeline(
    transitions.map((t) => ({
      at: t.createdAt,
      from: t.fromState as NcrState | null,
      to: t.toState as NcrState,
      actor: users.get(t.actorId) ?? '',
      reason: t.reason,
    })),
    signatures,
  );
  return {
    number: ncr.number,
    state: ncr.state as NcrState,
    severity: ncr.severity,
    lotCode: lot?.lotCode ?? null,
    awaitingSecondSignature: ncr.awaitingSecondSignature,
    assigneeId: ncr.assigneeId,
    lot: lot
      ? {
          lotCode: lot.lotCode,
          partNumber: lot.partNumber,
          kind: lot.partKind,
          supplier: (lot as PartLot & { supplier?: Supplier }).supplier?.name ?? '',
          status: lot.status,
        }
      : null,
    serial: item?.serial ?? null,
    itemKind: item?.kind ?? null,
    familyCode: presented?.family.code ?? null,
    stageCode: stage?.code ?? null,
    stageName: stage?.name ?? null,
    defectCode: defect?.code ?? null,
    description: ncr.description,
    disposition: ncr.disposition,
    raisedBy: users.get(ncr.raisedById) ?? '',
    assignee: ncr.assigneeId ? (users.get(ncr.assigneeId) ?? null) : null,
    raisedAt: ncr.createdAt.toISOString(),
    ageDays: Math.floor((Date.now() - ncr.createdAt.getTime()) / 86_400_000),
    failing: ncr.failing as FailingReading[],
    containment: ncr.containment,
    dispositionReason: ncr.dispositionReason,
    reworkStage: reworkStage ? { code: reworkStage.code, name: reworkStage.name } : null,
    decidedById: ncr.decidedById,
    decidedBy: ncr.decidedById ? (users.get(ncr.decidedById) ?? null) : null,
    decidedAt: ncr.decidedAt?.toISOString() ?? null,
    closedAt: ncr.closedAt?.toISOString() ?? null,
    stageResultId: ncr.stageResultId,
    origin: o
      ? {
          stageName: o.stage?.name ?? '',
          stationName: o.station?.name ?? null,
          operator: o.operator?.name ?? '',
          finishedAt: o.finishedAt.toISOString(),
        }
      : null,
    item: presented,
    timeline,
    signatures: signatures.map(presentSignature),
    photos: [...resultPhotos, ...ownPhotos],
    allowed: allowedActions(ncr, ctx.actor?.role as Role | undefined, ctx.actor?.id),
  };
}

// ——— transitions ———

const ACTION_WORDS: Record<NcrAction, string> = {
  review: 'start the review',
  disposition: 'decide it',
  countersign: 'countersign it',
  close: 'close it',
  void: 'void it',
};

function refuse(ncr: Nonconformance, action: NcrAction, ctx: Ctx): never {
  const allowed = allowedActions(ncr, ctx.actor!.role as Role, ctx.actor!.id);
  const label = NCR_STATE_LABELS[ncr.state as NcrState].toLowerCase();
  throw conflict(
    `${ncr.number} is ${label}${ncr.awaitingSecondSignature ? ' and waiting for a second signature' : ''}: you cannot ${ACTION_WORDS[action]} now.${
      allowed.length
        ? ` What you can do: ${allowed.map((a) => ACTION_WORDS[a]).join(', ')}.`
        : ' It takes no further steps.'
    }`,
    { reason: 'invalid_transition', state: ncr.state, allowed },
  );
}

async function transition(
  ctx: Ctx,
  transaction: Transaction,
  ncr: Nonconformance,
  to: NcrState,
  reason: string,
  changes: Partial<Nonconformance> = {},
) {
  const from = ncr.state as NcrState;
  const before = { state: from, disposition: ncr.disposition, assigneeId: ncr.assigneeId };
  await ncr.update(
    { ...changes, state: to, ...(to === 'closed' || to === 'voided' ? { closedAt: new Date() } : {}) },
    { transaction },
  );
  await NonconformanceTransition.create(
    { nonconformanceId: ncr.id, fromState: from, toState: to, actorId: ctx.actor!.id, reason },
    { transaction },
  );
  await recordAudit(ctx, transaction, {
    action: `ncr.${to}`,
    entity: 'nonconformance',
    entityId: ncr.number,
    before,
    after: { state: to, disposition: ncr.disposition, reworkStageId: ncr.reworkStageId, reason },
  });
}

function sign(
  ctx: Ctx,
  transaction: Transaction,
  ncr: Nonconformance,
  input: { password: string; meaning: string; reason: string },
) {
  return signWithPassword(ctx, transaction, {
    entity: 'nonconformance',
    entityId: ncr.number,
    ...input,
    refused: 'nothing was signed or changed.',
  });
}

/**
 * Lets the item go when no open NCR holds it any more. After a use-as-is on a failing result the
 * part carries on past the stage it failed; a concern raised by hand puts it back as it was.
 */
async function releaseIfClear(ctx: Ctx, transaction: Transaction, item: Item, ncr: Nonconformance) {
  if (item.status === 'scrapped') return;
  const open = await Nonconformance.findAll({
    where: { itemId: item.id, state: { [Op.in]: OPEN_NCR_STATES } },
    transaction,
  });
  const reworks = open.filter(
    (n) => n.state === 'decided' && (n.disposition === 'rework' || n.disposition === 'repair'),
  );
  if (open.length && open.length === reworks.length) {
    // only a decided rework is left: the part may now go through the stage it was sent back to
    const stageId = reworks[0]!.reworkStageId;
    if (item.status !== 'in_process' || item.currentStageId !== stageId) {
      const before = { status: item.status, currentStage: item.currentStageId };
      await item.update({ status: 'in_process', currentStageId: stageId }, { transaction });
      await recordAudit(ctx, transaction, {
        action: 'item.released_for_rework',
        entity: 'item',
        entityId: item.serial,
        before,
        after: { status: 'in_process', currentStage: stageId, byNcr: ncr.number, rework: reworks[0]!.number },
      });
    }
    return;
  }
  if (open.length) return;
  const before = { status: item.status, currentStage: item.currentStageId };
  let next: Partial<Item>;
  const result = ncr.stageResultId ? await StageResult.findByPk(ncr.stageResultId, { transaction }) : null;
  // a use-as-is accepts the failure; a void after a passing correction means the stage was passed
  const corrected = result
    ? await StageResult.findOne({ where: { supersedesId: result.id, verdict: 'pass' }, transaction })
    : null;
  if (result && (ncr.disposition === 'use_as_is' || corrected)) {
    const route = await routeOfItem(item, transaction);
    const steps = route?.steps ?? [];
    const at = steps.findIndex((s) => s.stageId === result.stageId);
    const following = steps[at + 1];
    next = following
      ? { status: 'in_process', currentStageId: following.stageId }
      : { status: 'finished', currentStageId: null };
  } else {
    let back = ncr.itemStatusBefore && ncr.itemStatusBefore !== 'on_hold' ? ncr.itemStatusBefore : 'in_process';
    // held while it was in a unit, taken out since: it is a finished part again, not installed
    if (back === 'installed' && !(await installedIn(item.id, transaction))) back = 'finished';
    next = { status: back };
  }
  if (next.status === item.status && (next.currentStageId ?? item.currentStageId) === item.currentStageId) return;
  await item.update(next, { transaction });
  await notifyIfReleasable(item.sequelize as Sequelize, item.id, transaction);
  await recordAudit(ctx, transaction, {
    action: 'item.released_from_hold',
    entity: 'item',
    entityId: item.serial,
    before,
    after: { status: item.status, currentStage: item.currentStageId, byNcr: ncr.number },
  });
}

/**
 * Every step follows the lock protocol (unit-locks.ts): the units the NCR's subject reaches, then
 * its item, then the NCR itself. A step can scrap a part or return a lot, which the release gate
 * must see, so it takes the same unit locks a release does.
 */
async function step<T>(
  sequelize: Sequelize,
  number: string,
  fn: (t: Transaction, ncr: Nonconformance, item: Item | null) => Promise<T>,
): Promise<T> {
  return sequelize.transaction(async (transaction) => {
    const peek = await findNcr(number, transaction);
    await lockUnitsReachedBy(sequelize, subjectOf(peek), transaction);
    const item = peek.itemId ? await Item.findByPk(peek.itemId, { transaction, lock: transaction.LOCK.UPDATE }) : null;
    const ncr = await findNcr(number, transaction, true);
    return fn(transaction, ncr, item);
  });
}

export async function startReview(sequelize: Sequelize, ctx: Ctx, number: string, note: string) {
  await step(sequelize, number, async (t, ncr) => {
    if (ncr.state !== 'raised') refuse(ncr, 'review', ctx);
    await transition(ctx, t, ncr, 'in_review', note || 'Review started', {
      assigneeId: ncr.assigneeId ?? ctx.actor!.id,
    });
  });
  return ncrDetail(number, ctx);
}

export async function assignNcr(sequelize: Sequelize, ctx: Ctx, number: string, assigneeId: number | null) {
  await step(sequelize, number, async (t, ncr) => {
    if (!OPEN_NCR_STATES.includes(ncr.state as NcrState)) refuse(ncr, 'review', ctx);
    if (assigneeId) {
      const u = await User.findByPk(assigneeId, { transaction: t });
      if (!u || !u.active || !can(u.role, 'ncr.disposition')) {
        throw invalid('Assign the NCR to an active quality engineer.', { assigneeId: 'Not a quality engineer.' });
      }
    }
    const before = { assigneeId: ncr.assigneeId };
    await ncr.update({ assigneeId }, { transaction: t });
    await recordAudit(ctx, t, {
      action: 'ncr.assigned',
      entity: 'nonconformance',
      entityId: ncr.number,
      before,
      after: { assigneeId },
    });
  });
  return ncrDetail(number, ctx);
}

export async function updateContainment(sequelize: Sequelize, ctx: Ctx, number: string, containment: string) {
  await step(sequelize, number, async (t, ncr) => {
    if (!OPEN_NCR_STATES.includes(ncr.state as NcrState)) {
      throw conflict(`${ncr.number} is ${ncr.state}: its containment note is part of the closed record.`);
    }
    const before = { containment: ncr.containment };
    await ncr.update({ containment }, { transaction: t });
    await recordAudit(ctx, t, {
      action: 'ncr.containment',
      entity: 'nonconformance',
      entityId: ncr.number,
      before,
      after: { containment },
    });
  });
  return ncrDetail(number, ctx);
}

async function decidedMail(t: Transaction, ncr: Nonconformance, serial: string, decider: string): Promise<Mail[]> {
  const raiser = await User.findByPk(ncr.raisedById, { attributes: ['email', 'name', 'active'], transaction: t });
  if (!raiser?.active) return [];
  return [
    {
      to: raiser.email,
      subject: `NCR ${ncr.number} on ${serial}: ${DISPOSITION_LABELS[ncr.disposition!]}`,
      text: [
        `${decider} decided ${ncr.number}, which you raised on ${serial}: ${DISPOSITION_LABELS[ncr.disposition!].toLowerCase()}.`,
        '',
        'Reason:',
        quoted(ncr.dispositionReason ?? ''),
        '',
        `Open it: ${ncrLink(ncr.number)}`,
        '',
        '— Coretrail',
      ].join('\n'),
      reason: 'ncr.decided',
    },
  ];
}

/**
 * Carries out a decision once it is fully signed: rework sends the part back, scrap ends it. The
 * step is recorded under the person who completed the decision, with their own words.
 */
async function carryOut(
  ctx: Ctx,
  t: Transaction,
  ncr: Nonconformance,
  item: Item | null,
  signer: string,
  words: string,
) {
  await transition(ctx, t, ncr, 'decided', words, {
    awaitingSecondSignature: false,
    decidedAt: new Date(),
  });
  const lot = ncr.partLotId ? await PartLot.findByPk(ncr.partLotId, { transaction: t, lock: t.LOCK.UPDATE }) : null;
  const serial = item?.serial ?? (lot ? `lot ${lot.lotCode}` : '');
  await enqueueMail(t, await decidedMail(t, ncr, serial, signer));
  if (!item) {
    if (lot) {
      const status =
        ncr.disposition === 'return_to_supplier' ? 'returned' : ncr.disposition === 'scrap' ? 'scrapped' : lot.status;
      if (status !== lot.status) {
        const before = { status: lot.status };
        await lot.update({ status }, { transaction: t });
        await recordAudit(ctx, t, {
          action: `lot.${status}`,
          entity: 'part_lot',
          entityId: lot.id,
          before,
          after: { status, byNcr: ncr.number },
        });
      }
    }
    await transition(ctx, t, ncr, 'closed', `${DISPOSITION_LABELS[ncr.disposition!]}: closed on decision`);
    return;
  }
  switch (ncr.disposition) {
    case 'rework':
    case 'repair': {
      const before = { status: item.status, currentStage: item.currentStageId };
      await item.update({ status: 'on_hold', currentStageId: ncr.reworkStageId }, { transaction: t });
      await recordAudit(ctx, t, {
        action: 'item.sent_back',
        entity: 'item',
        entityId: item.serial,
        before,
        after: { currentStage: ncr.reworkStageId, byNcr: ncr.number, disposition: ncr.disposition },
      });
      // with no other NCR holding it, the part may now be recorded at the rework stage
      if (!(await blockingNcrsOf(item.id, ncr.reworkStageId!, t)).length) {
        await item.update({ status: 'in_process' }, { transaction: t });
      }
      return;
    }
    case 'scrap': {
      const before = { status: item.status };
      await item.update({ status: 'scrapped', currentStageId: null }, { transaction: t });
      await recordAudit(ctx, t, {
        action: 'item.scrapped',
        entity: 'item',
        entityId: item.serial,
        before,
        after: { status: 'scrapped', byNcr: ncr.number },
      });
      await transition(ctx, t, ncr, 'closed', 'Scrapped: nothing further to do');
      return;
    }
    case 'use_as_is':
    case 'return_to_supplier': {
      await transition(ctx, t, ncr, 'closed', `${DISPOSITION_LABELS[ncr.disposition]}: closed on decision`);
      await releaseIfClear(ctx, t, item, ncr);
      return;
    }
  }
}

export async function disposition(sequelize: Sequelize, ctx: Ctx, number: string, body: DispositionBody) {
  await step(sequelize, number, async (t, ncr, item) => {
    if (ncr.state !== 'in_review' || ncr.awaitingSecondSignature) refuse(ncr, 'disposition', ctx);
    if (body.disposition === 'return_to_supplier' && !ncr.partLotId) {
      throw invalid('Return to supplier is for purchased lots; this NCR is on a part the plant remanufactures.', {
        disposition: 'Only for a purchased lot.',
      });
    }
    if (!item && (body.disposition === 'rework' || body.disposition === 'repair')) {
      throw invalid('A purchased lot has no route to send it back through: return it, scrap it or use it as is.', {
        disposition: 'Not for a lot.',
      });
    }
    let reworkStageId: number | null = null;
    if (body.reworkStage && item) {
      const stage = await Stage.findOne({ where: { code: body.reworkStage }, transaction: t });
      const route = await routeOfItem(item, t);
      const steps = route?.steps ?? [];
      const to = stage ? steps.findIndex((s) => s.stageId === stage.id) : -1;
      if (!stage || to < 0) {
        throw invalid(`Choose a stage on the route of ${item.serial}.`, { reworkStage: 'Not on this part’s route.' });
      }
      // back to the stage where it was found, or an earlier one: never past stages it has not passed
      const foundAt = steps.findIndex((s) => s.stageId === (ncr.stageId ?? item.currentStageId));
      if (foundAt >= 0 && to > foundAt) {
        const where = steps[foundAt]!.stage.name;
        throw invalid(`A rework goes back to ${where}, where the problem was found, or to an earlier stage.`, {
          reworkStage: `${where} or earlier.`,
        });
      }
      reworkStageId = stage.id;
    }
    const critical = ncr.severity === 'critical' && body.disposition === 'use_as_is';
    const { user } = await sign(ctx, t, ncr, {
      password: body.password,
      meaning: `${critical ? 'First signature: ' : ''}${DISPOSITION_LABELS[body.disposition]} on ${ncr.number}`,
      reason: body.reason,
    });
    await ncr.update(
      {
        disposition: body.disposition,
        dispositionReason: body.reason,
        reworkStageId,
        decidedById: user.id,
        awaitingSecondSignature: critical,
      },
      { transaction: t },
    );
    if (critical) {
      await recordAudit(ctx, t, {
        action: 'ncr.first_signature',
        entity: 'nonconformance',
        entityId: ncr.number,
        after: { disposition: body.disposition, reason: body.reason, signedBy: user.name },
      });
      await enqueueMail(t, await countersignMails(t, ncr, item?.serial ?? '', user));
      return;
    }
    await carryOut(ctx, t, ncr, item, user.name, `${DISPOSITION_LABELS[body.disposition]}: ${body.reason}`);
  });
  return ncrDetail(number, ctx);
}

/** A critical use-as-is signed once: every other quality engineer is asked for the second signature. */
async function countersignMails(t: Transaction, ncr: Nonconformance, serial: string, first: User): Promise<Mail[]> {
  const others = (await recipients(['quality'], t)).filter((u) => u.email !== first.email);
  return others.map((u) => ({
    to: u.email,
    subject: `Your signature is needed: use as is on critical NCR ${ncr.number} (${serial})`,
    text: [
      `${first.name} signed a use-as-is decision on ${ncr.number} (${serial}, critical). A critical use-as-is needs a second quality engineer before it takes effect.`,
      '',
      'Their reason:',
      quoted(ncr.dispositionReason ?? ''),
      '',
      `Read it and countersign, or void it: ${ncrLink(ncr.number)}`,
      '',
      '— Coretrail',
    ].join('\n'),
    reason: 'ncr.countersign_requested',
  }));
}

export async function countersign(
  sequelize: Sequelize,
  ctx: Ctx,
  number: string,
  body: { reason: string; password: string },
) {
  await step(sequelize, number, async (t, ncr, item) => {
    if (ncr.state !== 'in_review' || !ncr.awaitingSecondSignature) refuse(ncr, 'countersign', ctx);
    if (ncr.decidedById === ctx.actor!.id) {
      throw conflict('A critical use-as-is needs a second quality engineer: the first signer cannot sign again.', {
        reason: 'same_signer',
      });
    }
    const { user } = await sign(ctx, t, ncr, {
      password: body.password,
      meaning: `Second signature: use as is on ${ncr.number}`,
      reason: body.reason,
    });
    await recordAudit(ctx, t, {
      action: 'ncr.second_signature',
      entity: 'nonconformance',
      entityId: ncr.number,
      after: { signedBy: user.name, reason: body.reason },
    });
    await carryOut(ctx, t, ncr, item, user.name, `Use as is, countersigned: ${body.reason}`);
  });
  return ncrDetail(number, ctx);
}

/** A rework or repair closes only after a new passing result at the stage it went back to. */
export async function closeNcr(sequelize: Sequelize, ctx: Ctx, number: string, note: string) {
  await step(sequelize, number, async (t, ncr, item) => {
    if (ncr.state !== 'decided') refuse(ncr, 'close', ctx);
    const proof = await reworkProof(ncr, t);
    if (!proof) {
      const stage = ncr.reworkStageId ? await Stage.findByPk(ncr.reworkStageId, { transaction: t }) : null;
      throw conflict(
        `${ncr.number} can close only after a new passing result at ${stage?.name ?? 'the rework stage'}.`,
        {
          reason: 'rework_not_passed',
        },
      );
    }
    const at = (await Stage.findByPk(proof.stageId, { transaction: t }))?.name ?? 'the rework stage';
    await transition(ctx, t, ncr, 'closed', note || `Rework passed at ${at}`);
    if (item) await releaseIfClear(ctx, t, item, ncr);
  });
  return ncrDetail(number, ctx);
}

async function reworkProof(ncr: Nonconformance, transaction: Transaction) {
  if (!ncr.itemId || !ncr.reworkStageId || !ncr.decidedAt) return null;
  return StageResult.findOne({
    where: { itemId: ncr.itemId, stageId: ncr.reworkStageId, verdict: 'pass', createdAt: { [Op.gt]: ncr.decidedAt } },
    order: [['id', 'DESC']],
    transaction,
  });
}

/**
 * Called inside a station result's transaction: a result at the stage a rework sent the part back to
 * closes that NCR when it passes; when it fails, the new failure raises its own NCR, and the old one
 * closes pointing at it.
 */
export async function settleRework(
  ctx: Ctx,
  transaction: Transaction,
  item: Item,
  stageId: number,
  result: StageResult,
  newNcr: Nonconformance | null,
  stageName: string,
) {
  const waiting = await Nonconformance.findAll({
    where: {
      itemId: item.id,
      state: 'decided',
      reworkStageId: stageId,
      disposition: { [Op.in]: ['rework', 'repair'] },
    },
    transaction,
    lock: transaction.LOCK.UPDATE,
  });
  for (const ncr of waiting) {
    await transition(
      ctx,
      transaction,
      ncr,
      'closed',
      result.verdict === 'pass'
        ? `Rework passed at ${stageName}`
        : `Rework failed again at ${stageName}; carried on as ${newNcr?.number ?? 'a new NCR'}`,
    );
  }
  return waiting.map((n) => n.number);
}

export async function voidNcr(sequelize: Sequelize, ctx: Ctx, number: string, reason: string) {
  await step(sequelize, number, async (t, ncr, item) => {
    if (!['raised', 'in_review'].includes(ncr.state)) refuse(ncr, 'void', ctx);
    if (ncr.stageResultId) {
      const superseded = await StageResult.findOne({
        where: { supersedesId: ncr.stageResultId, verdict: 'pass' },
        transaction: t,
      });
      if (!superseded) {
        throw conflict(
          `${ncr.number} was raised by a failing result: a recorded failure is a fact. Disposition it, or correct the result first if the reading was wrong.`,
          { reason: 'raised_by_result' },
        );
      }
    }
    await transition(ctx, t, ncr, 'voided', reason, { awaitingSecondSignature: false });
    if (item) await releaseIfClear(ctx, t, item, ncr);
  });
  return ncrDetail(number, ctx);
}

// ——— defect codes: the plant's own list ———

export async function listDefectCodes() {
  const rows = await DefectCode.findAll({ order: [['code', 'ASC']] });
  return rows.map((d) => ({ code: d.code, description: d.description, active: d.active }));
}

export async function createDefectCode(sequelize: Sequelize, ctx: Ctx, body: { code: string; description: string }) {
  return sequelize.transaction(async (transaction) => {
    const d = await DefectCode.create({ code: body.code, description: body.description }, { transaction });
    await recordAudit(ctx, transaction, {
      action: 'defect_code.created',
      entity: 'defect_code',
      entityId: d.code,
      after: body,
    });
    return { code: d.code, description: d.description, active: d.active };
  });
}

/** Codes are never deleted (NCRs name them); one no longer used is made inactive. */
export async function updateDefectCode(
  sequelize: Sequelize,
  ctx: Ctx,
  code: string,
  body: { description?: string; active?: boolean },
) {
  return sequelize.transaction(async (transaction) => {
    const d = await DefectCode.findOne({ where: { code }, transaction, lock: transaction.LOCK.UPDATE });
    if (!d) throw notFound(`Defect code ${code}`);
    const before = { description: d.description, active: d.active };
    await d.update(body, { transaction });
    await recordAudit(ctx, transaction, {
      action: 'defect_code.updated',
      entity: 'defect_code',
      entityId: d.code,
      before,
      after: { description: d.description, active: d.active },
    });
    return { code: d.code, description: d.description, active: d.active };
  });
}
