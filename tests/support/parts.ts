import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { passingReadings } from '../../db/seeders/sample-readings.js';
import { Customer, EngineFamily } from '../../server/models/index.js';
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

export const gaugeFor = (form: StationFormJson) =>
  form.characteristics.some((c) => c.kind === 'variable') ? form.gauges.find((g) => g.usable)!.code : null;

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
      gauge: gaugeFor(form),
      readings: passingReadings(form),
    });
  if (res.status !== 201 || res.body.verdict !== 'pass') throw new Error(`pass failed: ${JSON.stringify(res.body)}`);
  return res.body;
}
