import { Op, QueryTypes, type Sequelize, type Transaction, type WhereOptions } from 'sequelize';
import { todayIn } from '../../shared/domain/warranty.js';
import type { Paged } from '../../shared/schemas/common.js';
import {
  kindLabel,
  type Drawable,
  type InspectionBody,
  type LotListQuery,
  type ReceivedLotDetailJson,
  type ReceivedLotJson,
  type ReceiveLotBody,
} from '../../shared/schemas/lots.js';
import { recordAudit, type Ctx } from '../audit.js';
import { AppError, conflict, invalid, notFound } from '../errors.js';
import { Attachment, Nonconformance, PartLot, Supplier, User } from '../models/index.js';
import { presentAttachment } from './attachments.js';
import { OPEN_NCR_STATES } from './ncrs/index.js';
import { plantSettings } from './plant.js';
import { readsTogether } from '../read/reads-together.js';

/**
 * Purchased lots as receiving logs them. A lot is received once (its code is unique per supplier
 * and part number), inspected (waiting, accepted, on hold, refused: only accepted can be drawn),
 * and drawn from by builds until nothing is left. Every change writes its audit event in the
 * same transaction.
 */

const STATUS_WORDS: Record<string, string> = {
  returned: 'returned to its supplier',
  scrapped: 'scrapped',
  on_hold: 'on hold',
};

/** Whether a lot can go into a unit now, and if not why, in words a builder acts on. */
export function drawableOf(lot: PartLot, heldBy: string | null, wanted = 1): Drawable {
  const name = `Lot ${lot.lotCode} (part number ${lot.partNumber})`;
  if (lot.inspection === 'pending') return { ok: false, why: `${name} is waiting for its receiving inspection.` };
  if (lot.inspection === 'on_hold')
    return { ok: false, why: `${name} is on hold at receiving: ${lot.inspectionReason}` };
  if (lot.inspection === 'refused')
    return { ok: false, why: `${name} was refused at receiving: ${lot.inspectionReason}` };
  if (lot.status !== 'usable') return { ok: false, why: `${name} is ${STATUS_WORDS[lot.status] ?? lot.status}.` };
  if (heldBy) return { ok: false, why: `${name} is held by ${heldBy}.` };
  const left = lot.quantityReceived - lot.quantityDrawn;
  if (left < wanted) {
    return {
      ok: false,
      why:
        left === 0
          ? `${name} has none left: all ${lot.quantityReceived} received have been used.`
          : `${name} has only ${left} left, not ${wanted}.`,
    };
  }
  return { ok: true };
}

/** The open NCR holding each lot, if any (a concern about the lot keeps it out of units). */
export async function holdingNcrs(lotIds: number[], transaction?: Transaction): Promise<Map<number, string>> {
  if (!lotIds.length) return new Map();
  const ncrs = await Nonconformance.findAll({
    attributes: ['partLotId', 'number'],
    where: { partLotId: { [Op.in]: lotIds }, state: { [Op.in]: OPEN_NCR_STATES } },
    order: [['id', 'ASC']],
    transaction,
  });
  const out = new Map<number, string>();
  for (const n of ncrs) if (n.partLotId && !out.has(n.partLotId)) out.set(n.partLotId, n.number);
  return out;
}

type Context = {
  suppliers: Map<number, string>;
  users: Map<number, string>;
  certificates: Map<number, Attachment>;
  held: Map<number, string>;
  sameCode: Map<string, { id: number; supplierId: number; partNumber: string }[]>;
};

async function contextOf(lots: PartLot[], transaction?: Transaction): Promise<Context> {
  const ids = lots.map((l) => l.id);
  const codes = [...new Set(lots.map((l) => l.lotCode.toUpperCase()))];
  const [suppliers, users, certificates, held, siblings] = await readsTogether(transaction, [
    () => Supplier.findAll({ attributes: ['id', 'name'], transaction }),
    () =>
      User.findAll({
        attributes: ['id', 'name'],
        where: { id: { [Op.in]: lots.map((l) => l.receivedById).filter((x): x is number => x !== null) } },
        transaction,
      }),
    () =>
      Attachment.findAll({
        where: { id: { [Op.in]: lots.map((l) => l.certificateAttachmentId).filter((x): x is number => x !== null) } },
        transaction,
      }),
    () => holdingNcrs(ids, transaction),
    () =>
      codes.length
        ? (PartLot.sequelize as Sequelize).query<{
            id: number;
            supplier_id: number;
            part_number: string;
            code: string;
          }>(
            `SELECT id, supplier_id, part_number, upper(lot_code) AS code FROM part_lots
            WHERE upper(lot_code) IN (:codes) ORDER BY part_number, id`,
            { type: QueryTypes.SELECT, replacements: { codes }, transaction },
          )
        : Promise.resolve([]),
  ]);
  const sameCode = new Map<string, { id: number; supplierId: number; partNumber: string }[]>();
  for (const s of siblings) {
    sameCode.set(s.code, [
      ...(sameCode.get(s.code) ?? []),
      { id: s.id, supplierId: s.supplier_id, partNumber: s.part_number },
    ]);
  }
  return {
    suppliers: new Map(suppliers.map((s) => [s.id, s.name])),
    users: new Map(users.map((u) => [u.id, u.name])),
    certificates: new Map(certificates.map((a) => [a.id, a])),
    held,
    sameCode,
  };
}

function present(lot: PartLot, c: Context): ReceivedLotJson {
  const cert = lot.certificateAttachmentId ? c.certificates.get(lot.certificateAttachmentId) : undefined;
  const oversize = (lot.attributes as { oversizeIn?: unknown }).oversizeIn;
  return {
    id: lot.id,
    supplier: { id: lot.supplierId, name: c.suppliers.get(lot.supplierId) ?? '' },
    kind: lot.partKind,
    kindLabel: kindLabel(lot.partKind),
    partNumber: lot.partNumber,
    lotCode: lot.lotCode,
    description: lot.description,
    quantityReceived: lot.quantityReceived,
    quantityDrawn: lot.quantityDrawn,
    quantityLeft: lot.quantityReceived - lot.quantityDrawn,
    receivedOn: lot.receivedOn,
    receivedBy: lot.receivedById ? (c.users.get(lot.receivedById) ?? null) : null,
    inspection: lot.inspection,
    inspectionReason: lot.inspectionReason,
    status: lot.status,
    oversizeIn: typeof oversize === 'number' ? oversize : null,
    certificate: cert ? presentAttachment(cert) : null,
    sameCode: (c.sameCode.get(lot.lotCode.toUpperCase()) ?? [])
      .filter((s) => s.id !== lot.id)
      .map((s) => ({ id: s.id, supplier: c.suppliers.get(s.supplierId) ?? '', partNumber: s.partNumber })),
    drawable: drawableOf(lot, c.held.get(lot.id) ?? null),
  };
}

/** What the audit event keeps of a lot. */
const snapshot = (lot: PartLot) => ({
  supplierId: lot.supplierId,
  kind: lot.partKind,
  partNumber: lot.partNumber,
  lotCode: lot.lotCode,
  quantityReceived: lot.quantityReceived,
  quantityDrawn: lot.quantityDrawn,
  receivedOn: lot.receivedOn,
  inspection: lot.inspection,
  inspectionReason: lot.inspectionReason,
  certificateAttachmentId: lot.certificateAttachmentId,
});

export async function receiveLot(sequelize: Sequelize, ctx: Ctx, body: ReceiveLotBody): Promise<ReceivedLotJson> {
  const id = await sequelize.transaction(async (transaction) => {
    const supplier = await Supplier.findByPk(body.supplierId, { transaction });
    if (!supplier) throw invalid('Choose the supplier from the list.', { supplierId: 'No such supplier.' });
    const today = todayIn((await plantSettings(transaction)).timeZone);
    if (body.receivedOn > today) {
      throw invalid('A lot cannot be received after today.', { receivedOn: `Today is ${today} at the plant.` });
    }
    const same = await PartLot.findOne({
      where: { supplierId: supplier.id, partNumber: body.partNumber, lotCode: body.lotCode },
      transaction,
    });
    if (same) {
      throw new AppError(
        'lot_exists',
        `Lot ${body.lotCode} of part number ${body.partNumber} from ${supplier.name} was already received on ${same.receivedOn}. A lot is received once; change its inspection on the lot's page.`,
        { lotCode: `Already received for part number ${body.partNumber}.` },
        { lotId: same.id },
      );
    }
    // the upload was checked as a PDF by its bytes; only its uploader may attach it, once
    const certificate = body.certificateAttachmentId
      ? await Attachment.findOne({
          where: {
            id: body.certificateAttachmentId,
            entity: 'pending',
            uploadedById: ctx.actor!.id,
            mimeType: 'application/pdf',
          },
          transaction,
          lock: transaction.LOCK.UPDATE,
        })
      : null;
    if (body.certificateAttachmentId && !certificate) {
      throw invalid('The certificate could not be attached: upload the PDF again.', {
        certificateAttachmentId: 'Unknown or already used certificate.',
      });
    }
    const lot = await PartLot.create(
      {
        supplierId: supplier.id,
        partKind: body.kind,
        partNumber: body.partNumber,
        lotCode: body.lotCode,
        description: body.description || kindLabel(body.kind),
        attributes: body.oversizeIn !== undefined ? { oversizeIn: body.oversizeIn } : {},
        quantityReceived: body.quantity,
        receivedOn: body.receivedOn,
        receivedById: ctx.actor!.id,
        inspection: body.inspection,
        inspectionReason: body.reason || null,
        certificateAttachmentId: body.certificateAttachmentId,
      },
      { transaction },
    );
    if (certificate) await certificate.update({ entity: 'part_lot', entityId: String(lot.id) }, { transaction });
    await recordAudit(ctx, transaction, {
      action: 'lot.received',
      entity: 'part_lot',
      entityId: lot.id,
      after: { ...snapshot(lot), supplier: supplier.name },
    });
    return lot.id;
  });
  return lotDetail(id);
}

/** Receiving inspection changes: a lot put on hold, refused, or accepted after all, with the reason. */
export async function setInspection(sequelize: Sequelize, ctx: Ctx, id: number, body: InspectionBody) {
  await sequelize.transaction(async (transaction) => {
    const lot = await PartLot.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!lot) throw notFound('That lot');
    if (lot.inspection === body.inspection) {
      throw conflict(`Lot ${lot.lotCode} is already ${body.inspection.replace('_', ' ')}.`);
    }
    const before = snapshot(lot);
    await lot.update({ inspection: body.inspection, inspectionReason: body.reason }, { transaction });
    await recordAudit(ctx, transaction, {
      action: 'lot.inspected',
      entity: 'part_lot',
      entityId: lot.id,
      before,
      after: snapshot(lot),
    });
  });
  return lotDetail(id);
}

export async function listLots(q: LotListQuery): Promise<Paged<ReceivedLotJson>> {
  const where: WhereOptions<PartLot>[] = [];
  if (q.q) {
    const like = `%${q.q.replace(/[\\%_]/g, (m) => `\\${m}`)}%`;
    where.push({ [Op.or]: [{ lotCode: { [Op.iLike]: like } }, { partNumber: { [Op.iLike]: like } }] });
  }
  if (q.supplierId) where.push({ supplierId: q.supplierId });
  if (q.inspection) where.push({ inspection: q.inspection });
  if (q.available === 'true') {
    where.push({ inspection: 'accepted', status: 'usable' });
    where.push(
      (PartLot.sequelize as Sequelize).where((PartLot.sequelize as Sequelize).literal('quantity_drawn'), {
        [Op.lt]: (PartLot.sequelize as Sequelize).col('quantity_received'),
      }),
    );
  }
  const { rows, count } = await PartLot.findAndCountAll({
    where: { [Op.and]: where },
    order: [
      ['receivedOn', 'DESC'],
      ['id', 'DESC'],
    ],
    limit: q.pageSize,
    offset: (q.page - 1) * q.pageSize,
  });
  const c = await contextOf(rows);
  return { rows: rows.map((l) => present(l, c)), total: count, page: q.page, pageSize: q.pageSize };
}

export async function lotDetail(id: number): Promise<ReceivedLotDetailJson> {
  const lot = await PartLot.findByPk(id);
  if (!lot) throw notFound('That lot');
  const [c, draws] = await Promise.all([
    contextOf([lot]),
    (PartLot.sequelize as Sequelize).query<{ serial: string; quantity: number; at: Date; by: string | null }>(
      `SELECT i.serial, ul.quantity, ul.created_at AS at, u.name AS by
         FROM unit_lots ul JOIN items i ON i.id = ul.unit_item_id LEFT JOIN users u ON u.id = ul.created_by_id
        WHERE ul.part_lot_id = :id ORDER BY ul.created_at DESC, ul.id DESC LIMIT 500`,
      { type: QueryTypes.SELECT, replacements: { id } },
    ),
  ]);
  return {
    ...present(lot, c),
    draws: draws.map((d) => ({ unit: d.serial, quantity: d.quantity, at: new Date(d.at).toISOString(), by: d.by })),
  };
}
