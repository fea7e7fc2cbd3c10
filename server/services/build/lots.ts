import type { Transaction } from 'sequelize';
import { LOT_KIND_LABELS, type BuildBody } from '../../../shared/schemas/build.js';
import { recordAudit, type Ctx } from '../../audit.js';
import { PartLot, Supplier, UnitLot, type Item } from '../../models/index.js';
import { drawableOf, holdingNcrs } from '../lots.js';
import type { SizeMatch } from '../size-classes.js';

/** A lot a build draws from, with how many and the line of the request that named it. */
export type Drawn = { lot: PartLot; quantity: number; i: number };

/**
 * Purchased lots: received first (receiving logs them), then drawn from; a lot waiting for its
 * inspection, on hold, refused, returned, held by an NCR or used up cannot go in. Locked in id
 * order, so two builds drawing from the same lots take turns and never draw past what came in.
 * Problems go into `problems`, by field.
 */
export async function lotsToDraw(body: BuildBody, problems: Record<string, string>, transaction: Transaction) {
  const wanted = await lotsNamed(body, problems, transaction);
  const lots: Drawn[] = [];
  const lockedLots = new Map<number, PartLot>();
  for (const id of [...new Set(wanted.map((w) => w.lot.id))].sort((a, b) => a - b)) {
    lockedLots.set(id, (await PartLot.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE }))!);
  }
  const held = await holdingNcrs([...lockedLots.keys()], transaction);
  // the same lot named twice draws both quantities
  const drawing = new Map<number, number>();
  for (const w of wanted) drawing.set(w.lot.id, (drawing.get(w.lot.id) ?? 0) + w.l.quantity);
  for (const w of wanted) {
    const lot = lockedLots.get(w.lot.id)!;
    const can = drawableOf(lot, held.get(lot.id) ?? null, drawing.get(lot.id)!);
    if (!can.ok) {
      problems[`lots.${w.i}.lotCode`] = `${can.why} Use another lot.`;
      continue;
    }
    lots.push({ lot, quantity: w.l.quantity, i: w.i });
  }
  return lots;
}

/** The lots the request names, each received from its supplier for its part number and kind. */
async function lotsNamed(body: BuildBody, problems: Record<string, string>, transaction: Transaction) {
  const wanted: { i: number; l: BuildBody['lots'][number]; lot: PartLot; supplier: Supplier }[] = [];
  for (const [i, l] of body.lots.entries()) {
    const supplier = await Supplier.findByPk(l.supplierId, { transaction });
    if (!supplier) {
      problems[`lots.${i}.supplierId`] = 'Unknown supplier.';
      continue;
    }
    const partNumber = l.partNumber.toUpperCase();
    const lotCode = l.lotCode.toUpperCase();
    const lot = await PartLot.findOne({ where: { supplierId: supplier.id, partNumber, lotCode }, transaction });
    if (!lot) {
      const elsewhere = await PartLot.findAll({
        attributes: ['partNumber'],
        where: { supplierId: supplier.id, lotCode },
        transaction,
      });
      problems[`lots.${i}.lotCode`] = elsewhere.length
        ? `Lot ${lotCode} from ${supplier.name} was received for part number ${elsewhere.map((x) => x.partNumber).join(', ')}, not ${partNumber}.`
        : `No lot ${lotCode} of part number ${partNumber} from ${supplier.name} has been received: receiving logs it before it can be built in.`;
      continue;
    }
    if (lot.partKind !== l.kind) {
      problems[`lots.${i}.lotCode`] =
        `Lot ${lot.lotCode} (part number ${lot.partNumber}) from ${supplier.name} is ${lot.partKind.replace(/_/g, ' ')}, not ${LOT_KIND_LABELS[l.kind].toLowerCase()}.`;
      continue;
    }
    wanted.push({ i, l, lot, supplier });
  }
  return wanted;
}

/** Draws each lot into the unit, with the size class it was matched to, and its audit event. */
export async function drawLots(
  ctx: Ctx,
  transaction: Transaction,
  unit: Item,
  lots: Drawn[],
  body: BuildBody,
  matched: Map<number, SizeMatch>,
) {
  for (const { lot, quantity, i } of lots) {
    const size = matched.get(i);
    await UnitLot.create(
      {
        unitItemId: unit.id,
        partLotId: lot.id,
        quantity,
        sizeClass: size?.sizeClass ?? (body.lots[i]!.sizeClass || null),
        matchedTo: size?.matchedTo ?? null,
        createdById: ctx.actor!.id,
      },
      { transaction },
    );
    const before = { quantityDrawn: lot.quantityDrawn, quantityLeft: lot.quantityReceived - lot.quantityDrawn };
    await lot.increment('quantityDrawn', { by: quantity, transaction });
    await lot.reload({ transaction });
    await recordAudit(ctx, transaction, {
      action: 'lot.drawn',
      entity: 'part_lot',
      entityId: lot.id,
      before,
      after: {
        quantityDrawn: lot.quantityDrawn,
        quantityLeft: lot.quantityReceived - lot.quantityDrawn,
        unit: unit.serial,
        quantity,
      },
    });
  }
}
