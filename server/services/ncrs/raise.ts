import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { type NcrDetail, type RaiseNcrBody, type Severity } from '../../../shared/schemas/ncr.js';
import { recordAudit, type Ctx } from '../../audit.js';
import { moveItem } from '../item-moves.js';
import { conflict, invalid } from '../../errors.js';
import { enqueueMail } from '../../mail/messages.js';
import { DefectCode, Item, Nonconformance, NonconformanceTransition, PartLot, Supplier } from '../../models/index.js';
import { claimUploads } from '../attachments.js';
import { openFieldActions } from '../field-actions.js';
import { findBySerial } from '../items.js';
import { lockUnitsReachedBy } from '../unit-locks.js';
import { subjectOf } from './holds.js';
import { raisedMails } from './mail.js';
import { ncrDetail } from './present.js';

/** NC-2026-00042: the year it was raised and a plant-wide running number. */
async function nextNumber(sequelize: Sequelize, transaction: Transaction) {
  const [row] = await sequelize.query<{ n: string }>("SELECT nextval('nonconformance_number_seq')::text AS n", {
    type: QueryTypes.SELECT,
    transaction,
  });
  return `NC-${new Date().getUTCFullYear()}-${row!.n.padStart(5, '0')}`;
}

export type FailingReading = NcrDetail['failing'][number];

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
      await moveItem(ctx, transaction, item, { status: 'on_hold' }, 'item.held', { byNcr: ncr.number });
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
