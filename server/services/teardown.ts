import { randomUUID } from 'node:crypto';
import type { Sequelize, Transaction } from 'sequelize';
import type { z } from 'zod';
import { WEAR_PARTS, type CORE_PARTS, type teardownBody, type TeardownPart } from '../../shared/schemas/intake.js';
import { PART_KIND_LABELS } from '../../shared/schemas/reference.js';
import { recordAudit, type Ctx } from '../audit.js';
import { conflict, invalid } from '../errors.js';
import { CoreReceipt, EngineFamily, Item, ItemLink, Stage, StageResult, User } from '../models/index.js';
import { findBySerial, newSerial, routeFor } from './items.js';
import { coreDetail } from './intake.js';

type Teardown = z.output<typeof teardownBody>;

/** The intake checklist's name for each part teardown can keep. */
const MISSING_NAME: Record<TeardownPart, (typeof CORE_PARTS)[number]> = {
  block: 'block',
  crankshaft: 'crankshaft',
  cylinder_head: 'cylinder_heads',
  camshaft: 'camshaft',
  rod_set: 'connecting_rods',
};

/** How many of each major part one core of a family can give. */
function allowance(family: EngineFamily): Record<TeardownPart, number> {
  return { block: 1, crankshaft: 1, cylinder_head: family.headsPerEngine, camshaft: 1, rod_set: 1 };
}

/**
 * Splits a received core into serialized parts. Each kept part gets its serial, a "harvested from"
 * link to the core and the first stage of its route; scrapped parts and the wear parts (always
 * replaced, common practice) are recorded on the core. All in one transaction.
 */
export async function tearDownCore(
  sequelize: Sequelize,
  ctx: Ctx,
  serialInput: string,
  body: Teardown,
  stationId: number | null = null,
) {
  const serial = await sequelize.transaction(async (transaction) => {
    const found = await findBySerial(serialInput, transaction);
    const core = (await Item.findByPk(found.id, { transaction, lock: transaction.LOCK.UPDATE }))!;
    if (core.kind !== 'core')
      throw conflict(`${core.serial} is a ${PART_KIND_LABELS[core.kind].toLowerCase()}, not a core.`);
    if (core.status === 'rejected') throw conflict(`${core.serial} was rejected at intake and cannot be torn down.`);
    if (core.status !== 'received') throw conflict(`${core.serial} has already been torn down.`);
    const family = (await EngineFamily.findByPk(core.engineFamilyId, { transaction }))!;
    const receipt = await CoreReceipt.findOne({ where: { itemId: core.id }, transaction });
    refuseMissingAtIntake(core, receipt, body);
    refuseMoreThanACoreHas(family, body);
    const created = await harvestParts(ctx, transaction, core, family, body.kept);
    await recordTeardown(ctx, transaction, core, { created, body, stationId });
    return core.serial;
  });
  return coreDetail(serial);
}

type Kept = { serial: string; kind: TeardownPart; position: string | null };

/** A part intake recorded as missing cannot be kept. */
function refuseMissingAtIntake(core: Item, receipt: CoreReceipt | null, body: Teardown) {
  const missingAtIntake = new Set((receipt?.condition as { missing?: string[] } | undefined)?.missing ?? []);
  for (const part of body.kept) {
    if (missingAtIntake.has(MISSING_NAME[part.kind])) {
      throw invalid(
        `Intake recorded the ${PART_KIND_LABELS[part.kind].toLowerCase()} as missing from ${core.serial}, so it cannot be kept. If it did arrive, correct the intake record first.`,
        { kept: 'A part recorded as missing at intake.' },
      );
    }
  }
}

/** No more of a kind than one core of the family gives; on a V engine, each head left or right once. */
function refuseMoreThanACoreHas(family: EngineFamily, body: Teardown) {
  const limits = allowance(family);
  const counts = new Map<TeardownPart, number>();
  for (const p of [...body.kept, ...body.scrapped]) counts.set(p.kind, (counts.get(p.kind) ?? 0) + 1);
  for (const [kind, n] of counts) {
    if (n > limits[kind]) {
      throw invalid(
        `A ${family.code} core has ${limits[kind]} ${PART_KIND_LABELS[kind].toLowerCase()}${limits[kind] > 1 ? 's' : ''}, not ${n}.`,
        {
          kept: 'Too many parts of one kind.',
        },
      );
    }
  }
  if (family.headsPerEngine > 1) {
    const heads = [...body.kept, ...body.scrapped]
      .filter((p) => p.kind === 'cylinder_head')
      .map((p) => p.position ?? '');
    if (heads.some((h) => !['left', 'right'].includes(h)) || new Set(heads).size !== heads.length) {
      throw invalid('On a V engine each head is the left or the right one, once each.', {
        kept: 'Say left or right for each head.',
      });
    }
  }
}

/** Each kept part serialized, linked to its core and started on its route. */
async function harvestParts(
  ctx: Ctx,
  transaction: Transaction,
  core: Item,
  family: EngineFamily,
  kept: Teardown['kept'],
): Promise<Kept[]> {
  const created: Kept[] = [];
  // two heads of a V share one route: read each kind's route once
  const routes = new Map<TeardownPart, Awaited<ReturnType<typeof routeFor>>>();
  for (const part of kept) {
    if (!routes.has(part.kind)) routes.set(part.kind, await routeFor(family.id, part.kind, transaction));
    const route = routes.get(part.kind)!;
    const first = route?.steps[0];
    const item = await Item.create(
      {
        serial: await newSerial(part.kind, transaction),
        kind: part.kind,
        engineFamilyId: family.id,
        status: route ? 'in_process' : 'in_stock',
        routeId: route?.route.id ?? null,
        currentStageId: first?.stageId ?? null,
        positionLabel: part.position ?? null,
        createdById: ctx.actor!.id,
      },
      { transaction },
    );
    await ItemLink.create(
      {
        parentItemId: core.id,
        childItemId: item.id,
        linkType: 'harvested_from',
        createdById: ctx.actor!.id,
        removedAt: null,
        removedReason: null,
      },
      { transaction },
    );
    await recordAudit(ctx, transaction, {
      action: 'item.harvested',
      entity: 'item',
      entityId: item.serial,
      after: {
        kind: item.kind,
        family: family.code,
        position: item.positionLabel,
        harvestedFrom: core.serial,
        firstStage: first?.stage.code ?? null,
      },
    });
    created.push({ serial: item.serial, kind: part.kind, position: item.positionLabel });
  }
  return created;
}

/** The teardown written on the core (and as its result at the teardown stage, where the plant has one). */
async function recordTeardown(
  ctx: Ctx,
  transaction: Transaction,
  core: Item,
  t: { created: Kept[]; body: Teardown; stationId: number | null },
) {
  const { body } = t;
  const by = await User.findByPk(ctx.actor!.id, { transaction });
  const teardown = {
    at: new Date().toISOString(),
    byId: ctx.actor!.id,
    by: by?.name ?? '',
    kept: t.created,
    scrapped: body.scrapped,
    discardedByRule: WEAR_PARTS,
    notes: body.notes,
  };
  const before = { status: core.status };
  const stage = await Stage.findOne({ where: { code: 'teardown' }, transaction });
  if (stage) {
    await StageResult.create(
      {
        itemId: core.id,
        stageId: stage.id,
        stationId: t.stationId,
        operatorId: ctx.actor!.id,
        gaugeId: null,
        startedAt: null,
        finishedAt: new Date(),
        verdict: 'pass',
        idempotencyKey: randomUUID(),
        supersedesId: null,
        correctionReason: null,
        reentryReason: null,
        reentryById: null,
        notes: body.notes,
      },
      { transaction },
    );
  }
  await core.update(
    { status: 'torn_down', currentStageId: null, attributes: { ...core.attributes, teardown } },
    { transaction },
  );
  await recordAudit(ctx, transaction, {
    action: 'core.torn_down',
    entity: 'item',
    entityId: core.serial,
    before,
    after: teardown,
  });
}
