import { randomInt } from 'node:crypto';
import { Op, type Sequelize, type Transaction } from 'sequelize';
import { makeSerial, parseSerial } from '../../shared/domain/serial.js';
import type { ItemJson, RouteStep } from '../../shared/schemas/items.js';
import { PART_KIND_LABELS, type PartKind } from '../../shared/schemas/reference.js';
import { invalid, notFound } from '../errors.js';
import { CoreReceipt, Item, ItemLink } from '../models/index.js';
import { referenceData, type Reference, type RouteWithSteps } from './reference-cache.js';
import { stepIndex } from '../../shared/domain/route.js';

/** A serial no item has yet. Collisions are astronomically rare (32^7 bodies); we still check. */
export async function newSerial(kind: PartKind, transaction: Transaction): Promise<string> {
  for (;;) {
    const serial = makeSerial(kind, randomInt);
    if (!(await Item.findOne({ where: { serial }, attributes: ['id'], transaction }))) return serial;
  }
}

/**
 * The ordered stages of a family's route for a part kind, or null where the kind has none. From the
 * reference data in memory (one version read); a caller holding the reference data asks it directly.
 */
export async function routeFor(
  familyId: number,
  kind: PartKind,
  transaction?: Transaction,
): Promise<RouteWithSteps | null> {
  return (await referenceData(Item.sequelize as Sequelize, transaction)).route(familyId, kind);
}

/** The route version the part started on (or the one in force, for a part that has none). */
export async function routeOfItem(
  item: { routeId: number | null; engineFamilyId: number; kind: string },
  transaction?: Transaction,
): Promise<RouteWithSteps | null> {
  return (await referenceData(Item.sequelize as Sequelize, transaction)).routeOfItem(item);
}

/** Finds an item by what someone typed or scanned; a malformed serial is a 400 with the reason. */
export async function findBySerial(input: string, transaction?: Transaction, { lock = false } = {}) {
  const serial = checkedSerial(input);
  const item = await Item.findOne({
    where: { serial },
    transaction,
    ...(lock && transaction ? { lock: transaction.LOCK.UPDATE } : {}),
  });
  if (!item) throw notFound(`Serial ${serial}`);
  return item;
}

/** A serial as typed or scanned, in its printed form; a malformed one is a 400 with the reason. */
export function checkedSerial(input: string) {
  const parsed = parseSerial(input);
  if (!parsed.ok) throw invalid(parsed.reason, { serial: parsed.reason });
  return parsed.serial;
}

/** A live genealogy link, as the trail reads them. */
export type KnownLink = { id: number; parent_item_id: number; child_item_id: number; link_type: string };

/**
 * `receipt`, `route`, `ref` (the reference data): what the caller has already read, so it is not read twice;
 * `genealogy`: every live link touching the item and the items at their ends (the trail has them).
 */
export async function presentItem(
  item: Item,
  {
    receipt,
    route: known,
    ref: knownRef,
    genealogy,
  }: {
    receipt?: CoreReceipt;
    route?: RouteWithSteps | null;
    ref?: Reference;
    genealogy?: { links: KnownLink[]; items: Item[] };
  } = {},
): Promise<ItemJson> {
  const ref = knownRef ?? (await referenceData(Item.sequelize as Sequelize));
  const family = ref.family(item.engineFamilyId)!;
  const route = known !== undefined ? known : ref.routeOfItem(item);
  const currentIdx = stepIndex(route?.steps ?? [], item.currentStageId);
  const finished = ['finished', 'torn_down', 'installed', 'released', 'shipped', 'returned'].includes(item.status);
  // a core exists because it was received: intake is behind it whether it was accepted or not
  const pastIntake = item.kind === 'core';
  const steps: RouteStep[] = (route?.steps ?? []).map((s, i) => ({
    code: s.stage.code,
    name: s.stage.name,
    position: s.position,
    required: s.required,
    hazard: s.stage.hazard,
    state:
      finished || (currentIdx >= 0 && i < currentIdx) || (pastIntake && s.stage.code === 'intake')
        ? 'done'
        : i === currentIdx
          ? 'current'
          : item.status === 'rejected' || item.status === 'scrapped'
            ? 'skipped'
            : 'todo',
  }));
  const current = currentIdx >= 0 ? route!.steps[currentIdx]!.stage : null;
  // a core's parts were harvested from it; a unit's parts are installed in it
  const partLink = item.kind === 'long_block' ? 'installed_in' : 'harvested_from';
  const intakeOf = () =>
    item.kind !== 'core'
      ? null
      : (receipt ?? CoreReceipt.findOne({ where: { itemId: item.id }, attributes: ['condition'] }));
  let originLink: { parentItemId: number } | null;
  let unitLink: { parentItemId: number } | null;
  let childLinks: { childItemId: number }[];
  let related: Item[];
  let intake: Awaited<ReturnType<typeof intakeOf>>;
  if (genealogy) {
    const live = (type: string) => genealogy.links.filter((l) => l.link_type === type);
    const up = (type: string) => {
      const l = live(type).find((x) => x.child_item_id === item.id);
      return l ? { parentItemId: l.parent_item_id } : null;
    };
    originLink = up('harvested_from');
    unitLink = up('installed_in');
    childLinks = live(partLink)
      .filter((l) => l.parent_item_id === item.id)
      .sort((a, b) => a.id - b.id)
      .map((l) => ({ childItemId: l.child_item_id }));
    related = genealogy.items;
    intake = await intakeOf();
  } else {
    [originLink, unitLink, childLinks, intake] = await Promise.all([
      ItemLink.findOne({ where: { childItemId: item.id, linkType: 'harvested_from', removedAt: null } }),
      ItemLink.findOne({ where: { childItemId: item.id, linkType: 'installed_in', removedAt: null } }),
      ItemLink.findAll({
        where: { parentItemId: item.id, linkType: partLink, removedAt: null },
        order: [['id', 'ASC']],
      }),
      intakeOf(),
    ]);
    related = await Item.findAll({
      where: {
        id: {
          [Op.in]: [
            originLink?.parentItemId ?? 0,
            unitLink?.parentItemId ?? 0,
            ...childLinks.map((l) => l.childItemId),
          ],
        },
      },
    });
  }
  const byId = new Map(related.map((r) => [r.id, r]));
  const origin = originLink ? byId.get(originLink.parentItemId) : undefined;
  return {
    serial: item.serial,
    kind: item.kind,
    kindLabel: PART_KIND_LABELS[item.kind],
    family: {
      id: family.id,
      code: family.code,
      name: family.name,
      layout: family.layout,
      headsPerEngine: family.headsPerEngine,
    },
    status: item.status,
    positionLabel: item.positionLabel,
    currentStage: current ? { code: current.code, name: current.name, hazard: current.hazard } : null,
    route: steps,
    harvestedFrom: origin ? { serial: origin.serial, kind: origin.kind } : null,
    installedIn:
      unitLink && byId.get(unitLink.parentItemId) ? { serial: byId.get(unitLink.parentItemId)!.serial } : null,
    parts: childLinks
      .map((l) => byId.get(l.childItemId))
      .filter((p): p is Item => !!p)
      .map((p) => ({
        serial: p.serial,
        kind: p.kind,
        kindLabel: PART_KIND_LABELS[p.kind],
        status: p.status,
        positionLabel: p.positionLabel,
      })),
    intakeCondition: intake ? (intake.condition as NonNullable<ItemJson['intakeCondition']>) : null,
    createdAt: item.createdAt.toISOString(),
  };
}
