import { Op, QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { LOT_KIND_LABELS, OVERSIZE_MATCH_IN, type BuildBody } from '../../shared/schemas/build.js';
import { PART_KIND_LABELS, type PartKind } from '../../shared/schemas/reference.js';
import { mmToIn } from '../../shared/domain/units.js';
import { recordAudit, type Ctx } from '../audit.js';
import { AppError } from '../errors.js';
import { Item, ItemLink, Nonconformance, PartLot, Stage, Supplier, UnitLot } from '../models/index.js';
import { findBySerial, newSerial, presentItem, routeFor } from './items.js';
import { blockingNcrsOf, OPEN_NCR_STATES } from './nonconformances.js';
import { familyByCode } from './spec.js';

/**
 * Building a long block: a finished block, crankshaft and the family's heads, plus purchased lots.
 * Every part is checked (finished its route, not held or scrapped, same family, not already in a
 * unit) and every problem is reported at once; the pistons' oversize must agree with the block's
 * finished bores. The unit gets its serial and its route; each part an "installed in" link.
 */

/** The unit a part is installed in, locked: every path that raises an NCR or releases takes it first. */
export async function lockUnitOf(part: number | { serial: string }, transaction: Transaction): Promise<Item | null> {
  // one statement: the live install link and the unit's row lock together
  const child = typeof part === 'number' ? ':part' : '(SELECT id FROM items WHERE serial = :part)';
  const [unit] = await Item.sequelize!.query(
    `SELECT u.* FROM items u
      WHERE u.id = (SELECT l.parent_item_id FROM item_links l
                     WHERE l.child_item_id = ${child} AND l.link_type = 'installed_in' AND l.removed_at IS NULL)
      FOR UPDATE OF u`,
    {
      replacements: { part: typeof part === 'number' ? part : part.serial },
      model: Item,
      mapToModel: true,
      transaction,
    },
  );
  return unit ?? null;
}

async function finishedRoute(item: Item, transaction: Transaction) {
  if (item.status === 'finished') return true;
  if (item.status !== 'in_process') return false;
  const route = await routeFor(item.engineFamilyId, item.kind, transaction);
  const steps = route?.steps ?? [];
  const at = steps.findIndex((s) => s.stageId === item.currentStageId);
  return at >= 0 && steps.slice(at).every((s) => !s.required);
}

/** The mean finished bore of a block, from its current bore-and-hone result. */
export async function finishedBore(sequelize: Sequelize, blockId: number, transaction?: Transaction) {
  const [row] = await sequelize.query<{ mean: string | null; n: number }>(
    `SELECT avg(rd.value)::text AS mean, count(*)::int AS n
       FROM stage_results r
       JOIN stages s ON s.id = r.stage_id AND s.code = 'bore-hone'
       JOIN readings rd ON rd.stage_result_id = r.id
       JOIN characteristics c ON c.id = rd.characteristic_id AND c.code = 'bore'
      WHERE r.item_id = :blockId
        AND NOT EXISTS (SELECT 1 FROM stage_results x WHERE x.supersedes_id = r.id)
        AND r.id = (SELECT max(r2.id) FROM stage_results r2 WHERE r2.item_id = :blockId AND r2.stage_id = r.stage_id
                      AND NOT EXISTS (SELECT 1 FROM stage_results y WHERE y.supersedes_id = r2.id))`,
    { type: QueryTypes.SELECT, replacements: { blockId }, transaction },
  );
  return row?.mean ? Number(row.mean) : null;
}

export async function buildUnit(sequelize: Sequelize, ctx: Ctx, body: BuildBody) {
  const serial = await sequelize.transaction(async (transaction) => {
    const family = await familyByCode(body.family, transaction);
    const slots: { field: string; kind: PartKind; input: string }[] = [
      { field: 'block', kind: 'block', input: body.block },
      { field: 'crankshaft', kind: 'crankshaft', input: body.crankshaft },
      ...body.heads.map((h, i) => ({ field: `heads.${i}`, kind: 'cylinder_head' as PartKind, input: h })),
    ];
    const problems: Record<string, string> = {};
    const found: { field: string; kind: PartKind; item: Item }[] = [];
    for (const s of slots) {
      try {
        found.push({ ...s, item: await findBySerial(s.input, transaction) });
      } catch (err) {
        problems[s.field] = (err as Error).message;
      }
    }
    // lock in id order, so two builds sharing a part cannot deadlock
    const locked = new Map<number, Item>();
    for (const f of [...found].sort((a, b) => a.item.id - b.item.id)) {
      locked.set(f.item.id, (await Item.findByPk(f.item.id, { transaction, lock: transaction.LOCK.UPDATE }))!);
    }
    if (family.headsPerEngine !== body.heads.length) {
      problems.heads = `A ${family.code} takes ${family.headsPerEngine} cylinder head${family.headsPerEngine > 1 ? 's' : ''}, not ${body.heads.length}.`;
    }
    for (const f of found) {
      const item = locked.get(f.item.id)!;
      const name = `${item.serial} (${PART_KIND_LABELS[item.kind].toLowerCase()})`;
      if (item.kind !== f.kind) {
        problems[f.field] =
          `${item.serial} is a ${PART_KIND_LABELS[item.kind].toLowerCase()}, not a ${PART_KIND_LABELS[f.kind].toLowerCase()}.`;
        continue;
      }
      if (item.engineFamilyId !== family.id) {
        problems[f.field] = `${name} belongs to another engine family, not ${family.code}.`;
        continue;
      }
      if (item.status === 'scrapped') {
        problems[f.field] = `${name} has been scrapped.`;
        continue;
      }
      const unit = await ItemLink.findOne({
        where: { childItemId: item.id, linkType: 'installed_in', removedAt: null },
        include: [{ model: Item, as: 'parent', attributes: ['serial'] }],
        transaction,
      });
      if (unit || item.status === 'installed') {
        const into = (unit as (ItemLink & { parent?: Item }) | null)?.parent?.serial;
        problems[f.field] = `${name} is already installed${into ? ` in ${into}` : ''}.`;
        continue;
      }
      const holds = await blockingNcrsOf(item.id, undefined, transaction);
      if (holds.length) {
        problems[f.field] = `${name} is on hold: ${holds.map((h) => h.number).join(', ')} open.`;
        continue;
      }
      if (!(await finishedRoute(item, transaction))) {
        const stage = item.currentStageId ? await Stage.findByPk(item.currentStageId, { transaction }) : null;
        problems[f.field] = `${name} has not finished its route${stage ? `: it is due at ${stage.name}` : ''}.`;
      }
    }
    if (family.headsPerEngine === 2) {
      const sides = found.filter((f) => f.kind === 'cylinder_head').map((f) => locked.get(f.item.id)!.positionLabel);
      if (sides.length === 2 && new Set(sides).size !== 2) {
        problems.heads = 'A V engine takes one left and one right head.';
      }
    }

    // the pistons must be made for the bore the block was finished to
    const pistons = body.lots.find((l) => l.kind === 'pistons');
    const block = found.find((f) => f.kind === 'block');
    if (pistons && block && !problems.block) {
      const mean = await finishedBore(sequelize, block.item.id, transaction);
      const standard = mmToIn(family.boreMm);
      if (mean === null) {
        problems['lots.pistons'] = `${block.item.serial} has no bore-and-hone result to match pistons against.`;
      } else {
        const over = mean - standard;
        if (Math.abs(over - (pistons.oversizeIn ?? 0)) > OVERSIZE_MATCH_IN) {
          problems['lots.pistons'] =
            `The pistons are +${(pistons.oversizeIn ?? 0).toFixed(3)} in, but ${block.item.serial} was finished +${over.toFixed(3)} in over its ${standard.toFixed(4)} in standard bore (mean ${mean.toFixed(4)} in).`;
        }
      }
    }

    // purchased lots: reused across units; one that is held or returned cannot go in
    const lots: { lot: PartLot; quantity: number }[] = [];
    for (const [i, l] of body.lots.entries()) {
      const supplier = await Supplier.findByPk(l.supplierId, { transaction });
      if (!supplier) {
        problems[`lots.${i}.supplierId`] = 'Unknown supplier.';
        continue;
      }
      const [lot] = await PartLot.findOrCreate({
        where: { supplierId: supplier.id, partNumber: l.partNumber.toUpperCase(), lotCode: l.lotCode.toUpperCase() },
        defaults: {
          supplierId: supplier.id,
          partKind: l.kind,
          partNumber: l.partNumber.toUpperCase(),
          lotCode: l.lotCode.toUpperCase(),
          description: LOT_KIND_LABELS[l.kind],
          attributes: l.oversizeIn !== undefined ? { oversizeIn: l.oversizeIn } : {},
        },
        transaction,
      });
      if (lot.partKind !== l.kind) {
        problems[`lots.${i}.lotCode`] =
          `Lot ${lot.lotCode} from ${supplier.name} is ${lot.partKind.replace(/_/g, ' ')}, not ${LOT_KIND_LABELS[l.kind].toLowerCase()}.`;
        continue;
      }
      const held = await Nonconformance.findOne({
        where: { partLotId: lot.id, state: { [Op.in]: OPEN_NCR_STATES } },
        transaction,
      });
      if (lot.status !== 'usable' || held) {
        problems[`lots.${i}.lotCode`] =
          `Lot ${lot.lotCode} is ${held ? `held by ${held.number}` : lot.status}: use another lot.`;
        continue;
      }
      lots.push({ lot, quantity: l.quantity });
    }

    const count = Object.keys(problems).length;
    if (count) {
      throw new AppError(
        409,
        'build_refused',
        `The long block was not started: ${Object.values(problems).join(' ')}`,
        problems,
      );
    }

    const route = await routeFor(family.id, 'long_block', transaction);
    const unit = await Item.create(
      {
        serial: await newSerial('long_block', transaction),
        kind: 'long_block',
        engineFamilyId: family.id,
        status: 'in_process',
        routeId: route?.route.id ?? null,
        currentStageId: route?.steps[0]?.stageId ?? null,
        positionLabel: null,
        attributes: body.notes ? { buildNotes: body.notes } : {},
        createdById: ctx.actor!.id,
      },
      { transaction },
    );
    for (const f of found) {
      const part = locked.get(f.item.id)!;
      await ItemLink.create(
        {
          parentItemId: unit.id,
          childItemId: part.id,
          linkType: 'installed_in',
          createdById: ctx.actor!.id,
          removedAt: null,
          removedReason: null,
        },
        { transaction },
      );
      const before = { status: part.status, currentStage: part.currentStageId };
      await part.update({ status: 'installed', currentStageId: null }, { transaction });
      await recordAudit(ctx, transaction, {
        action: 'item.installed',
        entity: 'item',
        entityId: part.serial,
        before,
        after: { status: 'installed', installedIn: unit.serial },
      });
    }
    for (const { lot, quantity } of lots) {
      await UnitLot.create(
        { unitItemId: unit.id, partLotId: lot.id, quantity, createdById: ctx.actor!.id },
        { transaction },
      );
    }
    await recordAudit(ctx, transaction, {
      action: 'unit.built',
      entity: 'item',
      entityId: unit.serial,
      after: {
        family: family.code,
        parts: found.map((f) => ({ kind: f.kind, serial: f.item.serial })),
        lots: lots.map(({ lot, quantity }) => ({
          kind: lot.partKind,
          partNumber: lot.partNumber,
          lotCode: lot.lotCode,
          quantity,
        })),
      },
    });
    return unit.serial;
  });
  return presentItem(await findBySerial(serial));
}
