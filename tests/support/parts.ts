import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { PLANT } from '../../db/seeders/plant.js';
import { nominalSizeClasses, passingReadings } from '../../db/seeders/sample-readings.js';
import { todayIn } from '../../shared/domain/warranty.js';
import { Customer, EngineFamily } from '../../server/models/index.js';
import { LOT_KINDS, type LotKind } from '../../shared/schemas/build.js';
import type { StationFormJson } from '../../shared/schemas/results.js';
import type { TestApp } from './app.js';
import { unique } from './app.js';

/** Test fixtures that make parts the way the plant does: receive a core, tear it down. */
export async function tornDownCore(t: TestApp, cookies: { receiving: string; operator: string }, familyCode: string) {
  const family = (await EngineFamily.findOne({ where: { code: familyCode } }))!;
  const customer = (await Customer.findOne())!;
  const core = await request(t.app)
    .post('/api/cores')
    .set('Cookie', cookies.receiving)
    .send({
      familyId: family.id,
      castingNumber: `CX ${unique('').slice(0, 6).toUpperCase()}`,
      idNumber: unique('ID').toUpperCase(),
      source: 'customer_return',
      customerId: customer.id,
      sourceReference: unique('RMA-'),
      receivedOn: new Date().toISOString().slice(0, 10),
      complete: true,
      grade: 'sound',
      accepted: true,
      creditDecision: 'full',
    });
  if (core.status !== 201) throw new Error(`receive failed: ${JSON.stringify(core.body)}`);
  const heads =
    family.headsPerEngine === 2
      ? [
          { kind: 'cylinder_head', position: 'left' },
          { kind: 'cylinder_head', position: 'right' },
        ]
      : [{ kind: 'cylinder_head' }];
  const td = await request(t.app)
    .post(`/api/cores/${core.body.serial}/teardown`)
    .set('Cookie', cookies.operator)
    .send({ kept: [{ kind: 'block' }, { kind: 'crankshaft' }, ...heads] });
  if (td.status !== 201) throw new Error(`teardown failed: ${JSON.stringify(td.body)}`);
  const kept = td.body.teardown.kept as { serial: string; kind: string; position: string | null }[];
  return {
    core: core.body.serial as string,
    block: kept.find((k) => k.kind === 'block')!.serial,
    crankshaft: kept.find((k) => k.kind === 'crankshaft')!.serial,
    heads: kept.filter((k) => k.kind === 'cylinder_head').map((k) => k.serial),
  };
}

/** The demo plant's station for each stage (db/seeders/plant.ts). */
export const BLOCK_STATIONS = ['CLN-1', 'MPI-1', 'PT-1', 'LH-1', 'BH-1', 'DK-1', 'WSH-1'];

/** Passes a part through stations in order. */
export async function passThrough(t: TestApp, cookie: string, stations: string[], serial: string) {
  for (const s of stations) await pass(t, cookie, s, serial);
}

export async function formFor(t: TestApp, cookie: string, station: string, serial: string) {
  const res = await request(t.app).get(`/api/stations/${station}/form`).query({ serial }).set('Cookie', cookie);
  if (res.status !== 200) throw new Error(`form failed: ${res.status} ${JSON.stringify(res.body)}`);
  return res.body as StationFormJson;
}

/**
 * The gauges a tablet would send: one for the result that can read the first measured
 * characteristic, and another for each measured characteristic it cannot (unit, range, resolution).
 */
export function gaugesOf(form: StationFormJson): { gauge: string | null; gauges: Record<string, string> } {
  const measured = form.characteristics.filter((c) => c.kind === 'variable' && !c.optional);
  if (!measured.length) return { gauge: null, gauges: {} };
  const usable = form.gauges.filter((g) => g.usable);
  const pick = (code: string) => (usable.find((g) => !g.unfit[code]) ?? usable[0]!).code;
  const gauge = pick(measured[0]!.code);
  const gauges: Record<string, string> = {};
  for (const c of measured) if (form.gauges.find((g) => g.code === gauge)?.unfit[c.code]) gauges[c.code] = pick(c.code);
  return { gauge, gauges };
}

export const gaugeFor = (form: StationFormJson) => gaugesOf(form).gauge;

/** Records a passing result at a station for a part that is due there. */
export async function pass(t: TestApp, cookie: string, station: string, serial: string) {
  const form = await formFor(t, cookie, station, serial);
  const res = await request(t.app)
    .post('/api/results')
    .set('Cookie', cookie)
    .send({
      idempotencyKey: randomUUID(),
      serial,
      station,
      ...gaugesOf(form),
      readings: passingReadings(form),
      sizeClasses: nominalSizeClasses(form),
    });
  if (res.status !== 201 || res.body.verdict !== 'pass') throw new Error(`pass failed: ${JSON.stringify(res.body)}`);
  return res.body;
}

export const CRANK_STATIONS = ['CLN-2', 'MPI-2', 'CG-1'];
export const HEAD_STATIONS = ['CLN-3', 'MPI-3', 'PT-2', 'DK-2', 'VS-1', 'HA-1'];

/** Parts of one core that have finished their routes, ready to build. */
export async function finishedParts(t: TestApp, cookies: { receiving: string; operator: string }, familyCode: string) {
  const parts = await tornDownCore(t, cookies, familyCode);
  await passThrough(t, cookies.operator, BLOCK_STATIONS, parts.block);
  await passThrough(t, cookies.operator, CRANK_STATIONS, parts.crankshaft);
  for (const h of parts.heads) await passThrough(t, cookies.operator, HEAD_STATIONS, h);
  return parts;
}

/**
 * The size classes the build is told for parts finished by these helpers (the class holding the
 * rule's nominal, spec-book.ts): pistons by their oversize (0.030 in over a CORRIE-8 bore, 0.5 mm
 * over a TARN-6 one), main bearings for journals ground 0.010 in under.
 */
export function classesFor(oversizeIn: number): Partial<Record<LotKind, string>> {
  const pistons = ({ 0.01: '+0.010', 0.02: '+0.020', 0.03: '+0.030', 0.0197: '+0.50' } as Record<number, string>)[
    oversizeIn
  ];
  return { ...(pistons ? { pistons } : {}), main_bearings: '-0.010' };
}

/**
 * The nine purchased lots a long block takes, pistons at the given oversize, as the build form
 * names them, with the size classes given; each is on record as received and accepted, as receiving
 * would have logged it (tests/api/receiving.test.ts drives receiving itself). A lot code shared by
 * several tests (the default tag) is topped up when fewer than 200 parts are left, so no test runs
 * another's lot dry.
 */
export async function lotsFor(oversizeIn: number, tag = 'T', classes = classesFor(oversizeIn)) {
  const { PartLot, Supplier } = await import('../../server/models/index.js');
  const suppliers = await Supplier.findAll({ order: [['id', 'ASC']] });
  const lots = LOT_KINDS.map((kind, i) => ({
    kind,
    supplierId: suppliers[i % suppliers.length]!.id,
    partNumber: `PN-${kind.toUpperCase().replace(/_/g, '')}-${i}`,
    lotCode: `${tag}-${kind.toUpperCase().replace(/_/g, '')}`.toUpperCase(),
    quantity: kind === 'pistons' ? 8 : 1,
    ...(kind === 'pistons' ? { oversizeIn } : {}),
    ...(classes[kind] ? { sizeClass: classes[kind] } : {}),
  }));
  for (const l of lots) {
    await PartLot.sequelize!.query(
      `INSERT INTO part_lots (supplier_id, part_kind, part_number, lot_code, description, attributes,
                              quantity_received, received_on, inspection)
       VALUES (:supplierId, :kind, :partNumber, :lotCode, :kind, :attributes, 1000, CURRENT_DATE, 'accepted')
       ON CONFLICT (supplier_id, part_number, lot_code) DO UPDATE
         SET quantity_received = part_lots.quantity_received + 1000
       WHERE part_lots.quantity_received - part_lots.quantity_drawn < 200`,
      {
        replacements: {
          ...l,
          attributes: JSON.stringify(l.oversizeIn !== undefined ? { oversizeIn: l.oversizeIn } : {}),
        },
      },
    );
  }
  return lots;
}

/** A long block built from finished parts, through assembly, run test and final inspection. */
export async function releasableUnit(
  t: TestApp,
  cookies: { receiving: string; operator: string },
  familyCode = 'TARN-6',
  lotTag = 'T',
) {
  const parts = await finishedParts(t, cookies, familyCode);
  const oversize = familyCode === 'CORRIE-8' ? 0.03 : 0.0197;
  const built = await request(t.app)
    .post('/api/units')
    .set('Cookie', cookies.operator)
    .send({
      family: familyCode,
      block: parts.block,
      crankshaft: parts.crankshaft,
      heads: parts.heads,
      lots: await lotsFor(oversize, lotTag),
    });
  if (built.status !== 201) throw new Error(`build failed: ${JSON.stringify(built.body)}`);
  const unit = built.body.serial as string;
  await passThrough(t, cookies.operator, ['AS-1', 'RT-1', 'FI-1'], unit);
  return { unit, parts };
}

/** Today in the demo plant's calendar: the ship date a release takes (not the UTC date). */
export const plantToday = () => todayIn(PLANT.timeZone);
