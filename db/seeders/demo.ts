import { Faker, en } from '@faker-js/faker';
import bcrypt from 'bcryptjs';
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { todayIn } from '../../shared/domain/warranty.js';
import { recordAudit, systemCtx } from '../../server/audit.js';
import { personSnapshot } from '../../server/services/people.js';
import { importApprovedBySeed } from '../../server/services/process/index.js';
import {
  Characteristic,
  EngineFamily,
  PlantSettings,
  Signature,
  Stage,
  Station,
  ToleranceRule,
  User,
} from '../../server/models/index.js';
import { seedDemoClaimsHistory } from './demo-claims-history.js';
import { seedDemoHistory } from './demo-history.js';
import { seedDemoPartsIfEmpty } from './demo-parts.js';
import { seedDemoQualifications } from './demo-qualifications.js';
import { demoProcessDocument } from './process-document.js';
import { CHARACTERISTICS, firstRules } from './spec-book.js';
import { DEFECT_CODES, DEMO_USERS, GAUGES, PLANT, STAGES, STATIONS } from './plant.js';

export { DEMO_USERS, PLANT };

// an arbitrary constant naming "seeding" among this database's advisory locks
const SEED_LOCK = 72_410_003;
const FAKER_SEED = 20261201;

async function insertMany(
  sequelize: Sequelize,
  transaction: Transaction,
  table: string,
  rows: Record<string, unknown>[],
) {
  if (!rows.length) return;
  await sequelize.getQueryInterface().bulkInsert(table, rows, { transaction });
}

/** Seeds the demo plant when the database has no users yet. Returns whether it seeded. */
/**
 * `history`: also months of shipped units for the control charts (demo-history.ts) and a year of
 * shipped units with a few claims (demo-claims-history.ts); the benchmark writes its own.
 */
export async function seedDemoIfEmpty(
  sequelize: Sequelize,
  { bcryptCost = 12, history = true } = {},
): Promise<boolean> {
  const seeded = await sequelize.transaction(async (transaction) => {
    await sequelize.query('SELECT pg_advisory_xact_lock(:k)', { replacements: { k: SEED_LOCK }, transaction });
    const [row] = await sequelize.query<{ n: number }>('SELECT count(*)::int AS n FROM users', {
      type: QueryTypes.SELECT,
      transaction,
    });
    if ((row?.n ?? 0) > 0) return false;
    await seedDemo(sequelize, transaction, bcryptCost);
    return true;
  });
  // parts on the line go through the product's own services, each in its own transaction
  if (seeded) await seedDemoPartsIfEmpty(sequelize);
  // months of shipped units before today, for the control charts (set-based, marked as demo history)
  if (seeded && history) await seedDemoHistory(sequelize);
  // a year of copies of the demo's own shipped unit, some with warranty claims (marked demo)
  if (seeded && history) await sequelize.transaction((t) => seedDemoClaimsHistory(sequelize, t));
  return seeded;
}

async function seedDemo(sequelize: Sequelize, transaction: Transaction, bcryptCost: number) {
  const ctx = systemCtx('seed');
  const faker = new Faker({ locale: [en] });
  faker.seed(FAKER_SEED);

  for (const u of DEMO_USERS) {
    const user = await User.create(
      {
        email: u.email,
        name: u.name,
        role: u.role,
        passwordHash: await bcrypt.hash(u.password, bcryptCost),
        lastSignInAt: null,
      },
      { transaction },
    );
    await recordAudit(ctx, transaction, {
      action: 'user.created',
      entity: 'user',
      entityId: user.id,
      after: personSnapshot(user),
    });
  }

  // defect codes first: the characteristics of the process document name them
  const seededAt = new Date();
  await insertMany(
    sequelize,
    transaction,
    'defect_codes',
    DEFECT_CODES.map((d) => ({ ...d, created_at: seededAt, updated_at: seededAt })),
  );
  // the process comes in as a plant's would: one process document through the import, drafted by
  // one quality engineer and approved by the other
  const [author, approver] = await User.findAll({ where: { role: 'quality' }, order: [['id', 'ASC']], transaction });
  await importApprovedBySeed(ctx, transaction, demoProcessDocument(), {
    author: author!,
    approver: approver!,
    reason: 'The demo plant’s process (invented), loaded with the demo',
    now: seededAt,
  });
  const families = await EngineFamily.findAll({ order: [['id', 'ASC']], transaction });
  const stageByCode = new Map((await Stage.findAll({ transaction })).map((s) => [s.code, s]));

  for (const s of STATIONS) {
    const station = await Station.create(
      { code: s.code, name: s.name, stageId: stageByCode.get(s.stage)!.id, location: s.location },
      { transaction },
    );
    await recordAudit(ctx, transaction, {
      action: 'station.created',
      entity: 'station',
      entityId: station.id,
      after: { code: s.code, name: s.name, stage: s.stage, location: s.location },
    });
  }

  const now = new Date();
  // the floor's people are signed off for the stages they record before any part reaches them
  await seedDemoQualifications(sequelize, transaction, ctx, todayIn(PLANT.timeZone, now), 'valve-seats');
  const stamp = { created_at: now, updated_at: now };
  const customerKinds = ['Fleet Services', 'Truck & Bus', 'Haulage', 'Agri Supply', 'Marine Power', 'Motor Factors'];
  const customers = Array.from({ length: 12 }, (_, i) => ({
    code: `C${String(i + 101)}`,
    name: `${faker.location.city()} ${faker.helpers.arrayElement(customerKinds)}`,
    email: `orders${i + 1}@customer${i + 1}.example`,
    ...stamp,
  }));
  const supplierKinds = [
    'Piston Works',
    'Bearing Co.',
    'Gasket Supply',
    'Core Brokers',
    'Valvetrain Parts',
    'Ring & Liner',
  ];
  const suppliers = Array.from({ length: 8 }, (_, i) => ({
    code: `S${String(i + 201)}`,
    name: `${faker.location.city()} ${supplierKinds[i % supplierKinds.length]}`,
    email: `sales${i + 1}@supplier${i + 1}.example`,
    ...stamp,
  }));
  await insertMany(sequelize, transaction, 'customers', customers);
  await insertMany(sequelize, transaction, 'suppliers', suppliers);
  // the plant's calendar: a gauge due in 12 days is due on the plant's date 12 days on
  const plantToday = todayIn(PLANT.timeZone, now);
  const dayOf = (days: number) =>
    new Date(Date.parse(`${plantToday}T00:00:00Z`) + days * 86_400_000).toISOString().slice(0, 10);
  await insertMany(
    sequelize,
    transaction,
    'gauges',
    GAUGES.map(({ dueInDays, rangeLow, rangeHigh, intervalDays, ...g }) => ({
      ...g,
      range_low: rangeLow,
      range_high: rangeHigh,
      interval_days: intervalDays,
      status: 'in_use',
      calibrated: true,
      calibration_due_on: dayOf(dueInDays),
      last_calibrated_on: dayOf(dueInDays - intervalDays),
      ...stamp,
    })),
  );
  // each gauge's last calibration, in house and in tolerance, at two points of its range (invented)
  const gaugeIds = new Map(
    (
      await sequelize.query<{ id: number; code: string }>('SELECT id, code FROM gauges', {
        type: QueryTypes.SELECT,
        transaction,
      })
    ).map((r) => [r.code, r.id]),
  );
  await insertMany(
    sequelize,
    transaction,
    'gauge_calibrations',
    GAUGES.map((g) => {
      const at = (f: number) => Number((g.rangeLow + (g.rangeHigh - g.rangeLow) * f).toFixed(4));
      const points = [at(0.25), at(0.75)].map((reference) => ({
        reference,
        asFound: reference,
        asLeft: reference,
        tolerance: g.resolution,
      }));
      return {
        gauge_id: gaugeIds.get(g.code),
        calibrated_on: dayOf(g.dueInDays - g.intervalDays),
        due_on: dayOf(g.dueInDays),
        result: 'in_tolerance',
        certificate: null,
        as_found_in_tolerance: true,
        as_left_in_tolerance: true,
        as_found_error: 0,
        points: JSON.stringify(points),
        performed_by: 'in_house',
        performer: 'Demo metrology bench',
        notes: 'Seeded with the demo plant.',
        created_at: now,
      };
    }),
  );

  await PlantSettings.update(
    { name: PLANT.name, address: PLANT.address, timeZone: PLANT.timeZone },
    { where: { id: 1 }, transaction },
  );
  // drafted by one quality engineer, approved by the other
  const specCounts = await seedSpecBook(ctx, transaction, stageByCode, families, author!, approver!, now);
  // the plant's balancer reads to 0.1 g·in: quality accepts five to one for residual imbalance, on record
  const relaxed =
    'The balancer reads to 0.1 g·in, the finest the plant has; five to one accepted for residual imbalance (demo).';
  const [imbalance] = await sequelize.query<{ id: number }>(
    "UPDATE characteristics SET gauge_ratio = 5, gauge_ratio_reason = :relaxed WHERE code = 'imbalance' RETURNING id",
    { type: QueryTypes.SELECT, replacements: { relaxed }, transaction },
  );
  if (imbalance) {
    await recordAudit(ctx, transaction, {
      action: 'characteristic.gauge_ratio_set',
      entity: 'characteristic',
      entityId: imbalance.id,
      before: { gaugeRatio: 10, reason: null },
      after: { gaugeRatio: 5, reason: relaxed },
    });
  }

  await recordAudit(ctx, transaction, {
    action: 'demo.seeded',
    entity: 'plant',
    entityId: 'demo',
    after: {
      plant: PLANT.name,
      stages: STAGES.length,
      customers: customers.length,
      suppliers: suppliers.length,
      defectCodes: DEFECT_CODES.length,
      gauges: GAUGES.length,
      ...specCounts,
      fakerSeed: FAKER_SEED,
    },
  });
}

/**
 * The stages' characteristics and version 1 of each family's spec book, approved and signed by the
 * demo quality engineer at seeding time (the signature's meaning says it came with the demo).
 */
async function seedSpecBook(
  ctx: ReturnType<typeof systemCtx>,
  transaction: Transaction,
  stageByCode: Map<string, Stage>,
  families: EngineFamily[],
  author: User,
  approver: User,
  now: Date,
) {
  // the document brought the measured and judged characteristics; the derived ones (the product's
  // own formulas) are added here, and all are laid out in the spec book's order
  const byKey = new Map<string, Characteristic>();
  const stageCode = new Map([...stageByCode.values()].map((s) => [s.id, s.code]));
  for (const c of await Characteristic.findAll({ transaction })) byKey.set(`${stageCode.get(c.stageId)}/${c.code}`, c);
  let order = 0;
  for (const c of CHARACTERISTICS) {
    const key = `${c.stage}/${c.code}`;
    const had = byKey.get(key);
    if (had) {
      await had.update({ sortOrder: order++ }, { transaction });
      continue;
    }
    const stage = stageByCode.get(c.stage);
    if (!stage) throw new Error(`spec book: no stage ${c.stage}`);
    const row = await Characteristic.create(
      {
        stageId: stage.id,
        code: c.code,
        name: c.name,
        kind: c.kind,
        unit: c.unit ?? null,
        resolution: c.resolution ?? null,
        positions: c.positions,
        derivation: c.derivation ?? null,
        critical: c.critical ?? false,
        sortOrder: order++,
        physicalMin: c.physical?.[0] ?? null,
        physicalMax: c.physical?.[1] ?? null,
        defectCode: c.defectCode,
        help: c.help ?? '',
        optional: c.optional ?? false,
        matesWith: c.matesWith ?? null,
      },
      { transaction },
    );
    byKey.set(key, row);
  }
  let rules = 0;
  for (const family of families) {
    for (const [key, limits] of Object.entries(firstRules(family.code))) {
      const c = byKey.get(key);
      if (!c) throw new Error(`spec book: no characteristic ${key}`);
      const rule = await ToleranceRule.create(
        {
          engineFamilyId: family.id,
          characteristicId: c.id,
          version: 1,
          status: 'approved',
          ...limits,
          unit: c.unit,
          effectiveFrom: now,
          supersededAt: null,
          createdById: author.id,
          approvedById: approver.id,
          approvedAt: now,
          approvalReason: 'Demo spec book (illustrative values) loaded with the demo plant',
        },
        { transaction },
      );
      await Signature.create(
        {
          userId: approver.id,
          printedName: approver.name,
          meaning: `Approved ${family.code} ${c.name}, version 1 (demo seed)`,
          reason: 'Demo spec book (illustrative values) loaded with the demo plant',
          entity: 'tolerance_rule',
          entityId: String(rule.id),
          signedAt: now,
        },
        { transaction },
      );
      rules += 1;
    }
  }
  await recordAudit(ctx, transaction, {
    action: 'spec.seeded',
    entity: 'spec_book',
    entityId: 'demo',
    after: { characteristics: CHARACTERISTICS.length, rules, draftedBy: author.name, approvedBy: approver.name },
  });
  return { characteristics: CHARACTERISTICS.length, rules };
}
