import { Op, QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import {
  FIELD_ACTION_DECISION_LABELS,
  type DecideFieldActionBody,
  type FieldActionJson,
  type FieldActionListQuery,
} from '../../shared/schemas/field-actions.js';
import type { Paged } from '../../shared/schemas/common.js';
import type { Severity } from '../../shared/schemas/ncr.js';
import { recordAudit, type Ctx } from '../audit.js';
import { conflict, notFound } from '../errors.js';
import { appLink } from '../mail/links.js';
import { enqueueMail, quoted } from '../mail/messages.js';
import { FieldAction, Nonconformance, Shipment, Signature, User } from '../models/index.js';
import { presentSignature, signWithPassword } from './signatures.js';
import type { LockedUnit } from './unit-locks.js';

/**
 * Late discoveries. An NCR raised on anything inside a unit that has already shipped cannot hold
 * the unit any more, so it opens a field action on that shipment: the warranty desk hears of it,
 * the trail shows it, and quality closes it with a signed decision (no action, notify the
 * customer, recall).
 */

async function nextNumber(sequelize: Sequelize, transaction: Transaction) {
  const [row] = await sequelize.query<{ n: string }>("SELECT nextval('field_action_number_seq')::text AS n", {
    type: QueryTypes.SELECT,
    transaction,
  });
  return `FA-${new Date().getUTCFullYear()}-${row!.n.padStart(5, '0')}`;
}

/**
 * Called in the NCR's transaction with the units it reaches, already locked: one field action per
 * live shipment among them.
 */
export async function openFieldActions(
  sequelize: Sequelize,
  ctx: Ctx,
  transaction: Transaction,
  ncr: Nonconformance,
  subject: string,
  units: LockedUnit[],
) {
  const shipped = units.filter((u) => u.status === 'shipped');
  if (!shipped.length) return [];
  const shipments = await Shipment.findAll({
    where: { unitItemId: { [Op.in]: shipped.map((u) => u.id) }, returnedAt: null },
    transaction,
  });
  const opened: string[] = [];
  const desk = await User.findAll({ where: { role: 'warranty', active: true }, attributes: ['email'], transaction });
  for (const s of shipments) {
    const unit = shipped.find((u) => u.id === s.unitItemId)!;
    const fa = await FieldAction.create(
      {
        number: await nextNumber(sequelize, transaction),
        shipmentId: s.id,
        unitItemId: unit.id,
        nonconformanceId: ncr.id,
        decision: null,
        decisionReason: null,
        decidedById: null,
        decidedAt: null,
      },
      { transaction },
    );
    await recordAudit(ctx, transaction, {
      action: 'field_action.opened',
      entity: 'field_action',
      entityId: fa.number,
      after: { unit: unit.serial, shipment: s.reference, ncr: ncr.number, subject },
    });
    await enqueueMail(
      transaction,
      desk.map((d) => ({
        to: d.email,
        subject: `Field action ${fa.number}: ${unit.serial} shipped with a problem now found (${ncr.number})`,
        text: [
          `${ncr.number} was raised on ${subject}, which is in ${unit.serial}. That unit has already shipped (order ${s.reference}).`,
          '',
          'What was found:',
          quoted(ncr.description),
          '',
          `Quality decides what is to be done in the field. Open it: ${appLink(`/field-actions/${fa.number}`)}`,
          '',
          '— Coretrail',
        ].join('\n'),
        reason: 'field_action.opened',
      })),
    );
    opened.push(fa.number);
  }
  return opened;
}

type Row = {
  id: number;
  number: string;
  state: 'open' | 'closed';
  serial: string;
  family: string;
  customer: string | null;
  customer_email: string | null;
  reference: string;
  ship_date: string;
  ncr_number: string;
  severity: Severity;
  description: string;
  subject: string;
  opened_at: Date;
  decision: FieldActionJson['decision'];
  decision_reason: string | null;
  decided_by: string | null;
  decided_at: Date | null;
};

const SELECT = `
  SELECT fa.id, fa.number, fa.state, u.serial, f.code AS family, c.name AS customer, c.email AS customer_email,
         s.reference, to_char(coalesce(s.ship_date, s.shipped_at::date), 'YYYY-MM-DD') AS ship_date,
         n.number AS ncr_number, n.severity, n.description,
         coalesce(i.serial, 'lot ' || pl.lot_code) AS subject,
         fa.created_at AS opened_at, fa.decision, fa.decision_reason, du.name AS decided_by, fa.decided_at
    FROM field_actions fa
    JOIN items u ON u.id = fa.unit_item_id
    JOIN engine_families f ON f.id = u.engine_family_id
    JOIN shipments s ON s.id = fa.shipment_id
    LEFT JOIN customers c ON c.id = s.customer_id
    JOIN nonconformances n ON n.id = fa.nonconformance_id
    LEFT JOIN items i ON i.id = n.item_id
    LEFT JOIN part_lots pl ON pl.id = n.part_lot_id
    LEFT JOIN users du ON du.id = fa.decided_by_id`;

function present(r: Row, signature: Signature | null): FieldActionJson {
  return {
    number: r.number,
    state: r.state,
    unit: { serial: r.serial, familyCode: r.family },
    shipment: { customer: r.customer, reference: r.reference, shipDate: r.ship_date },
    ncr: { number: r.ncr_number, severity: r.severity, description: r.description, subject: r.subject },
    openedAt: r.opened_at.toISOString(),
    decision: r.decision,
    decisionReason: r.decision_reason,
    decidedBy: r.decided_by,
    decidedAt: r.decided_at?.toISOString() ?? null,
    signature: signature ? presentSignature(signature) : null,
  };
}

async function signaturesOf(numbers: string[]) {
  if (!numbers.length) return new Map<string, Signature>();
  const rows = await Signature.findAll({ where: { entity: 'field_action', entityId: { [Op.in]: numbers } } });
  return new Map(rows.map((s) => [s.entityId, s]));
}

export async function listFieldActions(
  sequelize: Sequelize,
  q: FieldActionListQuery & { unitId?: number },
): Promise<Paged<FieldActionJson>> {
  const where: string[] = [];
  if (q.state) where.push('fa.state = :state');
  if (q.unitId) where.push('fa.unit_item_id = :unitId');
  const filter = where.length ? `WHERE ${where.join(' AND ')}` : '';
  const replacements = { state: q.state, unitId: q.unitId, limit: q.pageSize, offset: (q.page - 1) * q.pageSize };
  const [rows, [count]] = await Promise.all([
    sequelize.query<Row>(`${SELECT} ${filter} ORDER BY fa.created_at DESC, fa.id DESC LIMIT :limit OFFSET :offset`, {
      type: QueryTypes.SELECT,
      replacements,
    }),
    sequelize.query<{ n: number }>(`SELECT count(*)::int AS n FROM field_actions fa ${filter}`, {
      type: QueryTypes.SELECT,
      replacements,
    }),
  ]);
  const sigs = await signaturesOf(rows.map((r) => r.number));
  return {
    rows: rows.map((r) => present(r, sigs.get(r.number) ?? null)),
    total: count?.n ?? 0,
    page: q.page,
    pageSize: q.pageSize,
  };
}

async function findRow(sequelize: Sequelize, number: string, transaction?: Transaction) {
  const [row] = await sequelize.query<Row>(`${SELECT} WHERE fa.number = :number`, {
    type: QueryTypes.SELECT,
    replacements: { number },
    transaction,
  });
  if (!row) throw notFound(`Field action ${number}`);
  return row;
}

export async function fieldActionDetail(sequelize: Sequelize, number: string): Promise<FieldActionJson> {
  const row = await findRow(sequelize, number);
  return present(row, (await signaturesOf([number])).get(number) ?? null);
}

/** Quality's signed decision closes a field action; a notice or recall is mailed to the customer on file. */
export async function decideFieldAction(
  sequelize: Sequelize,
  ctx: Ctx,
  number: string,
  body: DecideFieldActionBody,
): Promise<FieldActionJson> {
  await sequelize.transaction(async (transaction) => {
    const fa = await FieldAction.findOne({ where: { number }, transaction, lock: transaction.LOCK.UPDATE });
    if (!fa) throw notFound(`Field action ${number}`);
    if (fa.state !== 'open') {
      throw conflict(`${number} was already decided: ${FIELD_ACTION_DECISION_LABELS[fa.decision!].toLowerCase()}.`, {
        reason: 'invalid_transition',
      });
    }
    const row = await findRow(sequelize, number, transaction);
    const label = FIELD_ACTION_DECISION_LABELS[body.decision];
    const { user } = await signWithPassword(ctx, transaction, {
      entity: 'field_action',
      entityId: number,
      meaning: `Decided field action ${number}: ${label.toLowerCase()}`,
      reason: body.reason,
      password: body.password,
      refused: 'the field action was not decided.',
    });
    await fa.update(
      {
        state: 'closed',
        decision: body.decision,
        decisionReason: body.reason,
        decidedById: user.id,
        decidedAt: new Date(),
      },
      { transaction },
    );
    await recordAudit(ctx, transaction, {
      action: 'field_action.decided',
      entity: 'field_action',
      entityId: number,
      before: { state: 'open' },
      after: { state: 'closed', decision: body.decision, reason: body.reason, signedBy: user.name },
    });
    if (body.decision !== 'no_action' && row.customer_email) {
      await enqueueMail(transaction, [
        {
          to: row.customer_email,
          subject: `${body.decision === 'recall' ? 'Recall' : 'Notice'}: engine ${row.serial} (your order ${row.reference})`,
          text: [
            `Dear ${row.customer ?? 'customer'},`,
            '',
            `The remanufactured engine ${row.serial} we shipped to you on ${row.ship_date} (order ${row.reference}) contains ${row.subject}, in which we have since found a problem.`,
            '',
            body.decision === 'recall'
              ? 'We are recalling this engine. Please do not install or run it until we have contacted you to arrange its return.'
              : 'We are letting you know so you can check it. We will contact you with what, if anything, needs doing.',
            '',
            'What our quality engineer decided, and why:',
            quoted(body.reason),
            '',
            `Signed: ${user.name}`,
          ].join('\n'),
          reason: `field_action.${body.decision}`,
        },
      ]);
    }
  });
  return fieldActionDetail(sequelize, number);
}
