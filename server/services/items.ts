import { randomInt } from 'node:crypto';
import { Op, type Transaction } from 'sequelize';
import { makeSerial, parseSerial } from '../../shared/domain/serial.js';
import type { ItemJson, RouteStep } from '../../shared/schemas/items.js';
import { PART_KIND_LABELS, type PartKind } from '../../shared/schemas/reference.js';
import { invalid, notFound } from '../errors.js';
import { CoreReceipt, EngineFamily, Item, ItemLink, Route, RouteStage, Stage } from '../models/index.js';

/** A serial no item has yet. Collisions are astronomically rare (32^7 bodies); we still check. */
export async function newSerial(kind: PartKind, transaction: Transaction): Promise<string> {
  for (;;) {
    const serial = makeSerial(kind, randomInt);
    if (!(await Item.findOne({ where: { serial }, attributes: ['id'], transaction }))) return serial;
  }
}

/** The ordered stages of a family's route for a part kind, or null where the kind has none. */
export async function routeFor(familyId: number, kind: PartKind, transaction?: Transaction) {
  const route = await Route.findOne({
    where: { engineFamilyId: familyId, partKind: kind, active: true },
    order: [['version', 'DESC']],
    transaction,
  });
  if (!route) return null;
  const steps = await RouteStage.findAll({
    where: { routeId: route.id },
    include: [{ model: Stage, as: 'stage' }],
    order: [['position', 'ASC']],
    transaction,
  });
  return { route, steps: steps.map((s) => ({ ...s.get(), stage: (s as RouteStage & { stage: Stage }).stage })) };
}

/** Finds an item by what someone typed or scanned; a malformed serial is a 400 with the reason. */
export async function findBySerial(input: string, transaction?: Transaction) {
  const parsed = parseSerial(input);
  if (!parsed.ok) throw invalid(parsed.reason, { serial: parsed.reason });
  const item = await Item.findOne({ where: { serial: parsed.serial }, transaction });
  if (!item) throw notFound(`Serial ${parsed.serial}`);
  return item;
}

/** `receipt`, `route`: what the caller has already read, so it is not read twice. */
export async function presentItem(
  item: Item,
  { receipt, route: known }: { receipt?: CoreReceipt; route?: Awaited<ReturnType<typeof routeFor>> } = {},
): Promise<ItemJson> {
  const family = (await EngineFamily.findByPk(item.engineFamilyId))!;
  const route = known !== undefined ? known : await routeFor(item.engineFamilyId, item.kind);
  const currentIdx = route?.steps.findIndex((s) => s.stageId === item.currentStageId) ?? -1;
  const finished = ['finished', 'torn_down', 'installed', 'released', 'shipped'].includes(item.status);
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
  const [originLink, unitLink, childLinks, intake] = await Promise.all([
    ItemLink.findOne({ where: { childItemId: item.id, linkType: 'harvested_from', removedAt: null } }),
    ItemLink.findOne({ where: { childItemId: item.id, linkType: 'installed_in', removedAt: null } }),
    ItemLink.findAll({
      where: { parentItemId: item.id, linkType: partLink, removedAt: null },
      order: [['id', 'ASC']],
    }),
    item.kind !== 'core'
      ? null
      : (receipt ?? CoreReceipt.findOne({ where: { itemId: item.id }, attributes: ['condition'] })),
  ]);
  const related = await Item.findAll({
    where: {
      id: {
        [Op.in]: [originLink?.parentItemId ?? 0, unitLink?.parentItemId ?? 0, ...childLinks.map((l) => l.childItemId)],
      },
    },
  });
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
