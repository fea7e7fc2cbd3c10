import { Op, QueryTypes, type Sequelize } from 'sequelize';
import type { BlastQuery, ContainBody, ContainmentJson } from '../../shared/schemas/gauges.js';
import { recordAudit, type Ctx } from '../audit.js';
import { conflict, invalid, notFound } from '../errors.js';
import { enqueueMail, quoted } from '../mail/messages.js';
import { Containment, ContainmentItem, DefectCode, FieldAction, Item, Signature } from '../models/index.js';
import { blastParts, scopeOf, whereNow } from './blast-radius/index.js';
import { moveItem } from './item-moves.js';
import { raiseNonconformance } from './ncrs/index.js';
import { signWithPassword } from './signatures.js';

/**
 * Containment in one signed step: everything the blast radius found still in the plant goes on
 * hold with an NCR of its own (so the release gate stops any unit it is in), and a part already
 * shipped gets an NCR that opens a field action on its unit's shipment. Locks follow the one
 * protocol (server/services/unit-locks.ts): every unit reached first, in id order, then the parts.
 */

async function nextNumber(sequelize: Sequelize, transaction: import('sequelize').Transaction) {
  const [row] = await sequelize.query<{ n: string }>("SELECT nextval('containment_number_seq')::text AS n", {
    type: QueryTypes.SELECT,
    transaction,
  });
  return `CT-${new Date().getUTCFullYear()}-${row!.n.padStart(5, '0')}`;
}

const MAX_PARTS = 2000;

export async function contain(sequelize: Sequelize, ctx: Ctx, body: ContainBody): Promise<ContainmentJson> {
  const number = await sequelize.transaction(async (transaction) => {
    const defect = await DefectCode.findOne({ where: { code: body.defectCode, active: true }, transaction });
    if (!defect)
      throw invalid('Choose a defect code from the list.', { defectCode: `No defect code ${body.defectCode}.` });
    const scope = await scopeOf(body.trigger, transaction);
    const first = await blastParts(sequelize, scope, transaction);
    if (!first.length) throw conflict('Nothing was touched: there is nothing to hold.', { reason: 'empty' });
    if (first.length > MAX_PARTS) {
      throw conflict(`${first.length} parts are in scope, more than ${MAX_PARTS} in one step: narrow the window.`);
    }
    // units first, lowest id first; then the parts themselves; then read again under the locks
    const unitIds = [...new Set(first.map((p) => p.unit_id).filter((v): v is number => v !== null))].sort(
      (a, b) => a - b,
    );
    if (unitIds.length) {
      await sequelize.query('SELECT id FROM items WHERE id IN (:ids) ORDER BY id FOR UPDATE', {
        type: QueryTypes.SELECT,
        replacements: { ids: unitIds },
        transaction,
      });
    }
    const partIds = first.map((p) => p.id).sort((a, b) => a - b);
    await sequelize.query('SELECT id FROM items WHERE id IN (:ids) ORDER BY id FOR UPDATE', {
      type: QueryTypes.SELECT,
      replacements: { ids: partIds },
      transaction,
    });
    const parts = await blastParts(sequelize, scope, transaction);

    const number = await nextNumber(sequelize, transaction);
    const { user } = await signWithPassword(ctx, transaction, {
      entity: 'containment',
      entityId: number,
      meaning: `Held what ${scope.subject} touched${body.fieldActions ? '; field actions for shipped units' : ''}`,
      reason: body.reason,
      password: body.password,
      refused: 'nothing was held.',
    });
    const c = await Containment.create(
      {
        number,
        triggerKind: scope.kind,
        trigger: body.trigger,
        reason: body.reason,
        defectCode: defect.code,
        createdById: user.id,
      },
      { transaction },
    );
    const outcomes: { serial: string; ncr: string | null; outcome: ContainmentItem['outcome'] }[] = [];
    for (const p of parts) {
      const where = whereNow(p);
      if (where === 'scrapped' || (where === 'shipped' && !body.fieldActions)) {
        if (where === 'scrapped') {
          await ContainmentItem.create(
            { containmentId: c.id, itemId: p.id, nonconformanceId: null, outcome: 'scrapped' },
            { transaction },
          );
          outcomes.push({ serial: p.serial, ncr: null, outcome: 'scrapped' });
        }
        continue;
      }
      const item = (await Item.findByPk(p.id, { transaction }))!;
      const ncr = await raiseNonconformance(sequelize, ctx, transaction, {
        itemId: item.id,
        itemSerial: item.serial,
        itemStatusBefore: item.status,
        stageId: item.currentStageId,
        stageResultId: null,
        severity: 'major',
        defectCode: defect.code,
        description:
          `${scope.label}. ${p.readings ? `${p.readings} reading${p.readings === 1 ? '' : 's'} of ${item.serial} in doubt${p.could_change ? `, ${p.could_change} of them close enough to a limit that the verdict could change` : ''}.` : ''} ${body.reason}`.trim(),
        failing: [],
        containment: `Containment ${number}`,
        origin: `Raised by containment ${number}`,
      });
      let outcome: ContainmentItem['outcome'] = 'field_action';
      if (where !== 'shipped') {
        outcome = item.status === 'on_hold' ? 'already_held' : 'held';
        if (item.status !== 'on_hold') {
          await moveItem(ctx, transaction, item, { status: 'on_hold' }, 'item.held', {
            byNcr: ncr.number,
            containment: number,
          });
        }
      }
      await ContainmentItem.create(
        { containmentId: c.id, itemId: item.id, nonconformanceId: ncr.id, outcome },
        { transaction },
      );
      outcomes.push({ serial: item.serial, ncr: ncr.number, outcome });
    }
    await recordAudit(ctx, transaction, {
      action: 'containment.opened',
      entity: 'containment',
      entityId: number,
      after: {
        trigger: body.trigger,
        label: scope.label,
        reason: body.reason,
        defectCode: defect.code,
        signedBy: user.name,
        held: outcomes.filter((o) => o.outcome === 'held').map((o) => o.serial),
        alreadyHeld: outcomes.filter((o) => o.outcome === 'already_held').map((o) => o.serial),
        fieldActions: outcomes.filter((o) => o.outcome === 'field_action').map((o) => o.serial),
        scrapped: outcomes.filter((o) => o.outcome === 'scrapped').map((o) => o.serial),
      },
    });
    return number;
  });
  return containmentDetail(sequelize, number);
}

export async function containmentDetail(sequelize: Sequelize, number: string): Promise<ContainmentJson> {
  const c = await Containment.findOne({ where: { number } });
  if (!c) throw notFound(`Containment ${number}`);
  const rows = await sequelize.query<{
    serial: string;
    ncr: string | null;
    outcome: ContainmentItem['outcome'];
    ncr_id: number | null;
  }>(
    `SELECT i.serial, n.number AS ncr, ci.outcome, ci.nonconformance_id AS ncr_id
       FROM containment_items ci JOIN items i ON i.id = ci.item_id
       LEFT JOIN nonconformances n ON n.id = ci.nonconformance_id
      WHERE ci.containment_id = :id ORDER BY i.serial`,
    { type: QueryTypes.SELECT, replacements: { id: c.id } },
  );
  const ncrIds = rows.map((r) => r.ncr_id).filter((v): v is number => v !== null);
  const fas = ncrIds.length
    ? await FieldAction.findAll({ where: { nonconformanceId: { [Op.in]: ncrIds } }, order: [['number', 'ASC']] })
    : [];
  const sig = await Signature.findOne({ where: { entity: 'containment', entityId: number } });
  return {
    number: c.number,
    triggerKind: c.triggerKind,
    trigger: c.trigger as BlastQuery,
    reason: c.reason,
    defectCode: c.defectCode,
    held: rows.map(({ serial, ncr, outcome }) => ({ serial, ncr, outcome })),
    fieldActions: fas.map((f) => f.number),
    notices: c.notices,
    signedBy: sig?.printedName ?? '',
    signedAt: (sig?.signedAt ?? c.createdAt).toISOString(),
  };
}

/** A notice to each customer with a unit in the containment's field actions, through the mail outbox. */
export async function draftCustomerNotice(sequelize: Sequelize, ctx: Ctx, number: string, message: string) {
  const sent = await sequelize.transaction(async (transaction) => {
    const c = await Containment.findOne({ where: { number }, transaction, lock: transaction.LOCK.UPDATE });
    if (!c) throw notFound(`Containment ${number}`);
    const rows = await sequelize.query<{
      customer: string | null;
      email: string | null;
      serial: string;
      reference: string;
      ship_date: string;
    }>(
      `SELECT DISTINCT cu.name AS customer, cu.email, u.serial, s.reference,
              to_char(coalesce(s.ship_date, s.shipped_at::date), 'YYYY-MM-DD') AS ship_date
         FROM containment_items ci
         JOIN field_actions fa ON fa.nonconformance_id = ci.nonconformance_id
         JOIN shipments s ON s.id = fa.shipment_id
         JOIN items u ON u.id = fa.unit_item_id
         LEFT JOIN customers cu ON cu.id = s.customer_id
        WHERE ci.containment_id = :id
        ORDER BY cu.name, u.serial`,
      { type: QueryTypes.SELECT, replacements: { id: c.id }, transaction },
    );
    const byEmail = new Map<string, typeof rows>();
    for (const r of rows) if (r.email) byEmail.set(r.email, [...(byEmail.get(r.email) ?? []), r]);
    if (!byEmail.size)
      throw conflict('No shipped unit with a customer e-mail on file is in this containment.', {
        reason: 'no_customers',
      });
    const mails = [...byEmail.entries()].map(([email, units]) => ({
      to: email,
      subject: `Notice about ${units.length === 1 ? `engine ${units[0]!.serial}` : `${units.length} engines`} we shipped to you`,
      text: [
        `Dear ${units[0]!.customer ?? 'customer'},`,
        '',
        quoted(message),
        '',
        'The engines concerned:',
        ...units.map((u) => `  ${u.serial}, shipped ${u.ship_date} (your order ${u.reference})`),
        '',
        `Our reference: ${number}.`,
      ].join('\n'),
      reason: 'containment.notice',
    }));
    await enqueueMail(transaction, mails);
    await c.update({ notices: c.notices + mails.length }, { transaction });
    await recordAudit(ctx, transaction, {
      action: 'containment.notice_drafted',
      entity: 'containment',
      entityId: number,
      after: { to: mails.map((m) => m.to), units: rows.map((r) => r.serial), message },
    });
    return mails.length;
  });
  return { ...(await containmentDetail(sequelize, number)), sent };
}
