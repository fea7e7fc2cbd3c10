import { QueryTypes, type Sequelize } from 'sequelize';
import type { z } from 'zod';
import {
  intakeMismatches,
  type CoreDetail,
  type CoreReceipt as CoreReceiptJson,
  type CoreSummary,
  type intakeLogQuery,
  type receiveCoreBody,
  type TeardownRecord,
} from '../../shared/schemas/intake.js';
import { csvDocument } from '../../shared/csv.js';
import { recordAudit, type Ctx } from '../audit.js';
import { conflict, invalid, notFound } from '../errors.js';
import { CoreReceipt, Customer, EngineFamily, Item, Supplier, User } from '../models/index.js';
import { attachmentsOf, claimUploads } from './attachments.js';
import { castingNotAccepted } from './process/index.js';
import { findBySerial, newSerial, presentItem, routeFor } from './items.js';

type ReceiveCore = z.output<typeof receiveCoreBody>;
type LogQuery = z.output<typeof intakeLogQuery>;

const DUPLICATE_WINDOW_DAYS = 365;
const compact = (s?: string) => s?.toUpperCase().replace(/[^A-Z0-9]/g, '');

/** Recent cores with the same ID number (or, without one, the same casting and no ID number). */
export async function findDuplicates(sequelize: Sequelize, castingNumber: string, idNumber?: string) {
  const since = new Date(Date.now() - DUPLICATE_WINDOW_DAYS * 86_400_000).toISOString().slice(0, 10);
  return sequelize.query<{
    serial: string;
    castingNumber: string;
    idNumber: string | null;
    receivedOn: string;
    accepted: boolean;
  }>(
    `SELECT i.serial, r.casting_number AS "castingNumber", r.id_number AS "idNumber",
            to_char(r.received_on, 'YYYY-MM-DD') AS "receivedOn", r.accepted
       FROM core_receipts r JOIN items i ON i.id = r.item_id
      WHERE r.received_on >= :since
        AND (${idNumber ? "regexp_replace(upper(r.id_number), '[^A-Z0-9]', '', 'g') = :idNumber" : "regexp_replace(upper(r.casting_number), '[^A-Z0-9]', '', 'g') = :castingNumber AND r.id_number IS NULL"})
      ORDER BY r.received_on DESC, r.id DESC LIMIT 5`,
    {
      type: QueryTypes.SELECT,
      // stamped numbers are compared without spaces, dashes, dots or slashes: "LV 208-113" is "LV208113"
      replacements: { since, idNumber: compact(idNumber), castingNumber: compact(castingNumber) },
    },
  );
}

/**
 * Logs a core at the dock, accepted or rejected, and gives it a serial. A rejected core keeps its
 * record, reason and photos like any other: nothing received is ever deleted.
 */
/** A casting number received before only as other families' cores: likely the wrong family chosen. */
async function castingElsewhere(sequelize: Sequelize, castingNumber: string, family: EngineFamily) {
  const rows = await sequelize.query<{ code: string; n: number }>(
    `SELECT f.code, count(*)::int AS n FROM core_receipts r JOIN items i ON i.id = r.item_id
       JOIN engine_families f ON f.id = i.engine_family_id
      WHERE upper(r.casting_number) = upper(:castingNumber)
      GROUP BY f.code ORDER BY n DESC`,
    { type: QueryTypes.SELECT, replacements: { castingNumber } },
  );
  if (!rows.length || rows.some((r) => r.code === family.code)) return [];
  const seen = rows.map((r) => `${r.code} (${r.n} core${r.n > 1 ? 's' : ''})`).join(', ');
  return [`Casting number ${castingNumber} has been received before only as ${seen}, not ${family.code}.`];
}

export async function receiveCore(sequelize: Sequelize, ctx: Ctx, body: ReceiveCore) {
  const family = await EngineFamily.findByPk(body.familyId);
  if (!family || !family.active)
    throw invalid('Choose an engine family in use.', { familyId: 'Unknown engine family.' });
  if (body.customerId && !(await Customer.findByPk(body.customerId))) {
    throw invalid('That customer is not on file.', { customerId: 'Unknown customer.' });
  }
  if (body.supplierId && !(await Supplier.findByPk(body.supplierId))) {
    throw invalid('That supplier is not on file.', { supplierId: 'Unknown supplier.' });
  }
  if (!body.confirmNotDuplicate) {
    const duplicates = await findDuplicates(sequelize, body.castingNumber, body.idNumber);
    if (duplicates.length) {
      throw conflict('A recent core has the same number. Check it is not the same core before logging a second one.', {
        reason: 'possible_duplicate',
        duplicates,
      });
    }
  }
  const mismatches = [
    ...intakeMismatches(body),
    ...(await castingNotAccepted(body.castingNumber, family)),
    ...(await castingElsewhere(sequelize, body.castingNumber, family)),
  ];
  if (mismatches.length && !body.mismatchReason) {
    throw conflict(`Check before logging: ${mismatches.join(' ')} Say why it is right to go on.`, {
      reason: 'needs_reason',
      mismatches,
    });
  }
  const route = await routeFor(family.id, 'core');
  const teardown = route?.steps.find((s) => s.stage.code === 'teardown');

  const serial = await sequelize.transaction(async (transaction) => {
    const item = await Item.create(
      {
        serial: await newSerial('core', transaction),
        kind: 'core',
        engineFamilyId: family.id,
        status: body.accepted ? 'received' : 'rejected',
        routeId: route?.route.id ?? null,
        currentStageId: body.accepted ? (teardown?.stageId ?? null) : null,
        positionLabel: null,
        createdById: ctx.actor!.id,
      },
      { transaction },
    );
    const receipt = await CoreReceipt.create(
      {
        itemId: item.id,
        castingNumber: body.castingNumber,
        idNumber: body.idNumber ?? null,
        source: body.source,
        customerId: body.customerId ?? null,
        supplierId: body.supplierId ?? null,
        sourceReference: body.sourceReference,
        receivedOn: body.receivedOn,
        receivedById: ctx.actor!.id,
        condition: {
          complete: body.complete,
          missing: body.missing,
          damage: body.damage,
          ...(mismatches.length ? { mismatches, mismatchReason: body.mismatchReason } : {}),
        },
        grade: body.grade,
        accepted: body.accepted,
        rejectReason: body.rejectReason ?? null,
        creditDecision: body.creditDecision ?? null,
        creditReason: body.creditReason ?? null,
        notes: body.notes,
      },
      { transaction },
    );
    await claimUploads(ctx, transaction, body.photoIds, 'core', item.id);
    await recordAudit(ctx, transaction, {
      action: body.accepted ? 'core.received' : 'core.rejected',
      entity: 'item',
      entityId: item.serial,
      after: { ...receipt.get({ plain: true }), serial: item.serial, familyCode: family.code, photoIds: body.photoIds },
    });
    return item.serial;
  });
  return coreDetail(serial);
}

export async function coreDetail(serialInput: string): Promise<CoreDetail> {
  const item = await findBySerial(serialInput);
  if (item.kind !== 'core') throw notFound(`Core ${item.serial}`);
  const receipt = (await CoreReceipt.findOne({ where: { itemId: item.id } }))!;
  const [customer, supplier, receivedBy, photos, presented] = await Promise.all([
    receipt.customerId ? Customer.findByPk(receipt.customerId) : null,
    receipt.supplierId ? Supplier.findByPk(receipt.supplierId) : null,
    User.findByPk(receipt.receivedById),
    attachmentsOf('core', item.id),
    presentItem(item, { receipt }),
  ]);
  return {
    ...presented,
    receipt: {
      castingNumber: receipt.castingNumber,
      idNumber: receipt.idNumber,
      source: receipt.source,
      customer: customer ? { id: customer.id, code: customer.code, name: customer.name } : null,
      supplier: supplier ? { id: supplier.id, code: supplier.code, name: supplier.name } : null,
      sourceReference: receipt.sourceReference,
      receivedOn: receipt.receivedOn,
      receivedBy: receivedBy?.name ?? '',
      condition: receipt.condition as CoreReceiptJson['condition'],
      grade: receipt.grade as CoreReceiptJson['grade'],
      accepted: receipt.accepted,
      rejectReason: receipt.rejectReason,
      creditDecision: receipt.creditDecision,
      creditReason: receipt.creditReason,
      notes: receipt.notes,
    },
    teardown: (item.attributes as { teardown?: TeardownRecord }).teardown ?? null,
    photos,
  };
}

const SORT_COLUMNS: Record<LogQuery['sort'], string> = {
  receivedOn: 'r.received_on',
  serial: 'i.serial',
  family: 'f.code',
  // by condition, best first, not alphabetically
  grade: "array_position(ARRAY['sound','workable','doubtful','unusable']::varchar[], r.grade)",
  castingNumber: 'r.casting_number',
};

/** The intake log: filtered, sorted and paged in SQL. */
export async function intakeLog(sequelize: Sequelize, q: LogQuery, { all = false } = {}) {
  const where: string[] = [];
  const replacements: Record<string, unknown> = {};
  const add = (sql: string, key: string, value: unknown) => {
    where.push(sql);
    replacements[key] = value;
  };
  if (q.family) add('i.engine_family_id = :family', 'family', q.family);
  if (q.source) add('r.source = :source', 'source', q.source);
  if (q.grade) add('r.grade = :grade', 'grade', q.grade);
  if (q.accepted) add('r.accepted = :accepted', 'accepted', q.accepted === 'true');
  if (q.from) add('r.received_on >= :from', 'from', q.from);
  if (q.to) add('r.received_on <= :to', 'to', q.to);
  if (q.q) {
    add(
      `(i.serial ILIKE :q OR replace(i.serial, '-', '') ILIKE :qCompact OR r.casting_number ILIKE :q
        OR regexp_replace(r.id_number, '[^A-Za-z0-9]', '', 'g') ILIKE :qCompact OR r.id_number ILIKE :q
        OR r.source_reference ILIKE :q)`,
      'q',
      `%${q.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`,
    );
    // '-' can never match a compacted value, so a search of only punctuation matches nothing extra
    replacements.qCompact = compact(q.q) ? `%${compact(q.q)}%` : '-';
  }
  const filter = where.length ? `WHERE ${where.join(' AND ')}` : '';
  const from = `FROM core_receipts r JOIN items i ON i.id = r.item_id JOIN engine_families f ON f.id = i.engine_family_id
    JOIN users u ON u.id = r.received_by_id LEFT JOIN customers c ON c.id = r.customer_id LEFT JOIN suppliers s ON s.id = r.supplier_id`;
  const order = `${SORT_COLUMNS[q.sort]} ${q.dir === 'asc' ? 'ASC' : 'DESC'} NULLS LAST, r.id ${q.dir === 'asc' ? 'ASC' : 'DESC'}`;
  const page = all ? '' : 'LIMIT :limit OFFSET :offset';
  const [rows, [count]] = await Promise.all([
    sequelize.query<CoreSummary>(
      `SELECT i.serial, f.code AS "familyCode", r.casting_number AS "castingNumber", r.id_number AS "idNumber", r.source,
              coalesce(c.name, s.name) AS "partyName", r.source_reference AS "sourceReference",
              to_char(r.received_on, 'YYYY-MM-DD') AS "receivedOn", u.name AS "receivedBy", r.grade, r.accepted,
              r.credit_decision AS "creditDecision", cr.credit_decision AS "settledCredit",
              cr.reason AS "settledReason", cr.by AS "settledBy", cr.created_at AS "settledAt", i.status
         ${from}
         -- the credit as settled after teardown: the newest revision, beside the dock's decision
         LEFT JOIN LATERAL (SELECT x.credit_decision, x.reason, x.created_at, ru.name AS by
                              FROM core_credit_revisions x JOIN users ru ON ru.id = x.revised_by_id
                             WHERE x.core_item_id = i.id ORDER BY x.id DESC LIMIT 1) cr ON true
         ${filter} ORDER BY ${order} ${page}`,
      {
        type: QueryTypes.SELECT,
        replacements: { ...replacements, limit: q.pageSize, offset: (q.page - 1) * q.pageSize },
      },
    ),
    sequelize.query<{ total: number }>(`SELECT count(*)::int AS total ${from} ${filter}`, {
      type: QueryTypes.SELECT,
      replacements,
    }),
  ]);
  return { rows, total: count?.total ?? 0, page: q.page, pageSize: q.pageSize };
}

export function intakeCsv(rows: CoreSummary[]): string {
  const head = [
    'serial',
    'family',
    'casting_number',
    'id_number',
    'source',
    'customer_or_supplier',
    'reference',
    'received_on',
    'received_by',
    'grade',
    'accepted',
    'core_credit',
    'core_credit_settled',
    'settled_reason',
    'settled_by',
    'settled_at',
    'status',
  ];
  return csvDocument(
    head,
    rows.map((r) => [
      r.serial,
      r.familyCode,
      r.castingNumber,
      r.idNumber,
      r.source,
      r.partyName,
      r.sourceReference,
      r.receivedOn,
      r.receivedBy,
      r.grade,
      r.accepted ? 'yes' : 'no',
      r.creditDecision,
      r.settledCredit,
      r.settledReason,
      r.settledBy,
      r.settledAt ? new Date(r.settledAt).toISOString() : null,
      r.status,
    ]),
  );
}
