import { randomUUID } from 'node:crypto';
import { Faker, en } from '@faker-js/faker';
import type { Sequelize } from 'sequelize';
import type { Ctx } from '../../server/audit.js';
import { Customer, EngineFamily, Item, Station, Supplier, User } from '../../server/models/index.js';
import { receiveCore } from '../../server/services/intake.js';
import { stationForm, submitResult } from '../../server/services/results/index.js';
import { tearDownCore } from '../../server/services/teardown.js';
import { buildBody, LOT_KINDS } from '../../shared/schemas/build.js';
import { receiveCoreBody, teardownBody } from '../../shared/schemas/intake.js';
import { buildUnit } from '../../server/services/build/index.js';
import { receiveLot } from '../../server/services/lots.js';
import { receiveLotBody } from '../../shared/schemas/lots.js';
import { releaseUnit } from '../../server/services/release/index.js';
import { todayIn } from '../../shared/domain/warranty.js';
import { DEMO_USERS, PLANT } from './plant.js';
import { nominalSizeClasses, passingReadings } from './sample-readings.js';

/**
 * Work in process for the demo, made through the same services the screens use: cores received
 * and torn down, and their parts walked along their routes to different stations, so every
 * station has something to scan. One block failed bore and hone and waits on hold with its NCR.
 */

// a different constant from the plant's seed, so the two sequences do not echo each other
const FAKER_SEED = 20261202;

const ROUTE_STATIONS: Record<string, string[]> = {
  block: ['CLN-1', 'MPI-1', 'PT-1', 'LH-1', 'BH-1', 'DK-1', 'WSH-1'],
  crankshaft: ['CLN-2', 'MPI-2', 'CG-1', 'BAL-1'],
  cylinder_head: ['CLN-3', 'MPI-3', 'PT-2', 'DK-2', 'VS-1', 'HA-1'],
};

/** How far along its route each demo core's parts go (number of stations passed). */
type Plan = {
  family: string;
  block: number;
  crankshaft: number;
  heads: number;
  failBore?: boolean;
  /** Build the parts into a long block and pass it through this many of its stations; ship it after all three. */
  unit?: { stations: number; ship?: boolean };
};
const PLAN: Plan[] = [
  { family: 'CORRIE-8', block: 4, crankshaft: 2, heads: 4 },
  { family: 'CORRIE-8', block: 4, crankshaft: 3, heads: 5 },
  { family: 'CORRIE-8', block: 4, crankshaft: 2, heads: 1, failBore: true },
  { family: 'CORRIE-8', block: 7, crankshaft: 4, heads: 6, unit: { stations: 3, ship: true } },
  { family: 'TARN-6', block: 7, crankshaft: 3, heads: 6, unit: { stations: 1 } },
  { family: 'CORRIE-8', block: 1, crankshaft: 0, heads: 0 },
  { family: 'TARN-6', block: 4, crankshaft: 3, heads: 4 },
  { family: 'TARN-6', block: 5, crankshaft: 1, heads: 2 },
  { family: 'TARN-6', block: 0, crankshaft: 0, heads: 0 },
];

/** The gauge the demo plant uses for a characteristic, where a unit alone does not say (invented). */
export const PREFERRED_GAUGE: Record<string, string> = {
  'main-journal': 'OM-022',
  'rod-journal': 'OM-022',
  'main-journal-at-fit': 'OM-022',
  'rod-journal-at-fit': 'OM-022',
  'piston-skirt': 'OM-035',
  'main-bore': 'BG-021',
  'deck-point': 'DI-031',
  'seat-runout': 'DI-031',
  'end-play': 'DI-031',
  'ring-gap-top': 'FG-012',
  'ring-gap-second': 'FG-012',
  compression: 'CG-006',
  'main-bearing-id': 'BG-030',
  'rod-bearing-id': 'BG-030',
  torque: 'DY-001',
  speed: 'TA-002',
};

type Form = Awaited<ReturnType<typeof stationForm>>;

/** One gauge for the result, and another for each measured characteristic read with a different one. */
export function gaugesFor(form: Form) {
  const usable = form.gauges.filter((g) => g.usable);
  // only gauges that can measure it (unit, range, resolution), as the station offers them
  const pick = (c: (typeof form.characteristics)[number]) => {
    const fit = usable.filter((g) => !g.unfit[c.code]);
    return (
      fit.find((g) => g.code === PREFERRED_GAUGE[c.code]) ?? fit.find((g) => g.unit === c.unit) ?? fit[0] ?? usable[0]!
    );
  };
  const measured = form.characteristics.filter((c) => c.kind === 'variable' && !c.optional);
  if (!measured.length) return { gauge: null, gauges: {} };
  const gauge = pick(measured[0]!).code;
  const gauges: Record<string, string> = {};
  for (const c of measured) if (pick(c).code !== gauge) gauges[c.code] = pick(c).code;
  return { gauge, gauges };
}

/** Records a passing result for a part due at a station, through the station service, as a tablet would. */
export async function recordPassingResult(
  sequelize: Sequelize,
  operator: Ctx,
  station: string,
  serial: string,
  vary: (form: Form, characteristic: string, position: string, value: number) => number = (_f, _c, _p, v) => v,
) {
  const form = await stationForm(station, serial);
  const { gauge, gauges } = gaugesFor(form);
  return submitResult(sequelize, operator, {
    idempotencyKey: randomUUID(),
    serial,
    station,
    gauge,
    gauges,
    startedAt: null,
    notes: '',
    readings: passingReadings(form, (c, p, v) => vary(form, c, p, v)),
    photoIds: [],
    sizeClasses: nominalSizeClasses(form),
  });
}

export async function seedDemoPartsIfEmpty(sequelize: Sequelize): Promise<number> {
  if ((await Item.count()) > 0) return 0;
  const faker = new Faker({ locale: [en] });
  faker.seed(FAKER_SEED);
  const as = async (role: string): Promise<Ctx> => {
    const u = (await User.findOne({ where: { role, email: `${role}@larkspur.example` } }))!;
    return { actor: { id: u.id, role: u.role }, requestId: 'demo-seed' };
  };
  const receiving = await as('receiving');
  const operator = await as('operator');
  const customers = await Customer.findAll({ order: [['id', 'ASC']] });
  const suppliers = await Supplier.findAll({ order: [['id', 'ASC']] });
  const stations = new Set((await Station.findAll()).map((s) => s.code));
  let results = 0;

  const walk = async (serial: string, route: string[], upTo: number, failAt?: string) => {
    for (const code of route.slice(0, upTo)) {
      if (!stations.has(code)) continue;
      await recordPassingResult(sequelize, operator, code, serial, (form, c, p, v) => {
        if (code === failAt && c === 'bore' && p === 'c7/bottom/axial') return 4.0309;
        // scatter measured sizes a little inside their limits, as real readings are
        const rule = form.characteristics.find((x) => x.code === c)?.rule;
        // assembly clearances are differences of two readings: scattering both could push them out
        if (rule?.limitType === 'nominal' && rule.minusTol && code !== 'AS-1') {
          const spread = faker.number.int({ min: -2, max: 2 }) * (rule.resolution ?? 0.0001);
          return Math.round((v + spread) / (rule.resolution ?? 0.0001)) * (rule.resolution ?? 0.0001);
        }
        return v;
      });
      results += 1;
    }
  };

  for (const [i, plan] of PLAN.entries()) {
    const family = (await EngineFamily.findOne({ where: { code: plan.family } }))!;
    const purchased = i % 4 === 3;
    const core = await receiveCore(
      sequelize,
      receiving,
      receiveCoreBody.parse({
        familyId: family.id,
        castingNumber: `${plan.family === 'CORRIE-8' ? 'CR8' : 'TN6'}-${faker.string.numeric(5)}`,
        idNumber: faker.string.alphanumeric({ length: 8, casing: 'upper' }),
        source: purchased ? 'purchased' : 'customer_return',
        customerId: purchased ? undefined : customers[i % customers.length]!.id,
        supplierId: purchased ? suppliers[3]!.id : undefined,
        sourceReference: `${purchased ? 'PO' : 'RMA'}-${faker.string.numeric(6)}`,
        receivedOn: new Date(Date.now() - (PLAN.length - i) * 86_400_000).toISOString().slice(0, 10),
        complete: true,
        grade: 'sound',
        accepted: true,
        creditDecision: purchased ? undefined : 'full',
        confirmNotDuplicate: true,
      }),
    );
    if (plan.block === 0 && plan.crankshaft === 0 && plan.heads === 0 && i === PLAN.length - 1) continue;
    const heads =
      family.headsPerEngine === 2
        ? [
            { kind: 'cylinder_head' as const, position: 'left' },
            { kind: 'cylinder_head' as const, position: 'right' },
          ]
        : [{ kind: 'cylinder_head' as const }];
    const detail = await tearDownCore(
      sequelize,
      operator,
      core.serial,
      teardownBody.parse({ kept: [{ kind: 'block' }, { kind: 'crankshaft' }, ...heads] }),
    );
    const kept = detail.teardown!.kept;
    for (const part of kept) {
      if (part.kind === 'block') {
        await walk(
          part.serial,
          ROUTE_STATIONS.block!,
          plan.block + (plan.failBore ? 1 : 0),
          plan.failBore ? 'BH-1' : undefined,
        );
      }
      if (part.kind === 'crankshaft') await walk(part.serial, ROUTE_STATIONS.crankshaft!, plan.crankshaft);
      if (part.kind === 'cylinder_head') await walk(part.serial, ROUTE_STATIONS.cylinder_head!, plan.heads);
    }
    if (plan.unit) {
      const lots = LOT_KINDS.map((kind, k) => ({
        kind,
        supplierId: suppliers[k % suppliers.length]!.id,
        partNumber: `${kind.slice(0, 3).toUpperCase()}-${family.code.slice(0, 1)}${faker.string.numeric(4)}`,
        lotCode: `L${faker.string.numeric(2)}-${faker.string.alpha({ length: 3, casing: 'upper' })}`,
        quantity: kind === 'pistons' || kind === 'lifters' ? family.cylinders * (kind === 'lifters' ? 2 : 1) : 1,
        ...(kind === 'pistons' ? { oversizeIn: family.code === 'CORRIE-8' ? 0.03 : 0.0197 } : {}),
        // of the size classes the demo's bores and main journals are finished to (spec-book.ts)
        ...(kind === 'pistons' ? { sizeClass: family.code === 'CORRIE-8' ? '+0.030' : '+0.50' } : {}),
        ...(kind === 'main_bearings' ? { sizeClass: '-0.010' } : {}),
      }));
      // receiving logged each lot first, with a few more parts than this unit takes
      for (const l of lots) {
        await receiveLot(
          sequelize,
          receiving,
          receiveLotBody.parse({
            supplierId: l.supplierId,
            kind: l.kind,
            partNumber: l.partNumber,
            lotCode: l.lotCode,
            quantity: l.quantity * 4,
            receivedOn: todayIn(PLANT.timeZone),
            inspection: 'accepted',
            ...(l.oversizeIn !== undefined ? { oversizeIn: l.oversizeIn } : {}),
          }),
        );
      }
      const unit = await buildUnit(
        sequelize,
        operator,
        buildBody.parse({
          family: family.code,
          block: kept.find((k) => k.kind === 'block')!.serial,
          crankshaft: kept.find((k) => k.kind === 'crankshaft')!.serial,
          heads: kept.filter((k) => k.kind === 'cylinder_head').map((k) => k.serial),
          lots,
        }),
      );
      await walk(unit.serial, ['AS-1', 'RT-1', 'FI-1'], plan.unit.stations);
      if (plan.unit.ship) {
        await releaseUnit(sequelize, await as('shipping'), unit.serial, {
          customerId: customers[2]!.id,
          reference: `SO-${faker.string.numeric(5)}`,
          shipDate: todayIn(PLANT.timeZone),
          carrier: 'Valley Freight',
          // signed as the demo's shipper would sign it
          password: DEMO_USERS.find((u) => u.role === 'shipping')!.password,
        });
      }
    }
  }
  return results;
}
