import request from 'supertest';
import { expect } from 'vitest';
import { unique, type TestApp } from './app.js';

/**
 * A block characteristic of the caller's own (deck height, mm), at a stage of its own that no
 * route or station uses, so no other test's parts are asked for it. Made through the API by
 * `cookie`, someone who may edit the process; `prefix` names the stage and the characteristic.
 */
export async function ownCharacteristic(t: TestApp, cookie: string, prefix: string, stageName: string) {
  const stage = `${prefix}-stage-${unique('').slice(0, 8)}`;
  const made = await request(t.app)
    .post('/api/process/stages')
    .set('Cookie', cookie)
    .send({ code: stage, partKind: 'block', name: stageName });
  expect(made.status).toBe(201);
  const res = await request(t.app)
    .post('/api/process/characteristics')
    .set('Cookie', cookie)
    .send({
      stage,
      code: `${prefix}-${unique('').slice(0, 8)}`,
      name: 'Deck height',
      kind: 'variable',
      unit: 'mm',
      resolution: 0.01,
      physicalMin: 100,
      physicalMax: 300,
    });
  expect(res.status).toBe(201);
  return res.body as { id: number };
}
