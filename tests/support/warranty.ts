import { randomUUID } from 'node:crypto';
import { Op, QueryTypes } from 'sequelize';
import request from 'supertest';
import { Customer } from '../../server/models/index.js';
import { TEST_PASSWORD, cookieFor, makeUser, type TestApp } from './app.js';
import { cloneUnits, type UnitCopy } from './clone-units.js';
import { plantToday, releasableUnit } from './parts.js';

/** The people a claim passes through, each with a session and a cheap signature. */
export async function claimPeople(t: TestApp) {
  const make = async (role: Parameters<typeof makeUser>[0], name: string) => {
    const user = await makeUser(role, { name, quickSignature: true });
    return { user, cookie: await cookieFor(user, t.config) };
  };
  return {
    desk: await make('warranty', 'Claim Desk'),
    receiving: await make('receiving', 'Dock Receiver'),
    operator: await make('operator', 'Teardown Operator'),
    quality: await make('quality', 'Claim Quality'),
    shipping: await make('shipping', 'Claim Shipper'),
  };
}
export type ClaimPeople = Awaited<ReturnType<typeof claimPeople>>;

/** A customer with an e-mail address on file (the decision is mailed to it). */
export const mailedCustomer = async () =>
  (await Customer.findOne({ where: { email: { [Op.ne]: null } }, order: [['id', 'ASC']] }))!;

/**
 * Shipped units for claims: one Tarn six built through the stations, copied `n` times in SQL
 * (tests/support/clone-units.ts), each copy released through the API with the shipper's signature.
 */
export async function shippedUnits(t: TestApp, people: ClaimPeople, n: number): Promise<UnitCopy[]> {
  const tag = `W${randomUUID().slice(0, 6).toUpperCase()}`;
  const { unit } = await releasableUnit(
    t,
    { receiving: people.receiving.cookie, operator: people.operator.cookie },
    'TARN-6',
    tag,
  );
  const copies = await cloneUnits(t.sequelize, unit, n);
  await copyReadings(t, unit, copies);
  const customer = await mailedCustomer();
  for (const c of copies) {
    const res = await request(t.app)
      .post(`/api/units/${c.unit}/release`)
      .set('Cookie', people.shipping.cookie)
      .send({ customerId: customer.id, reference: `SO-${c.unit}`, shipDate: plantToday(), password: TEST_PASSWORD });
    if (res.status !== 201) throw new Error(`release failed: ${JSON.stringify(res.body)}`);
  }
  return copies;
}

/**
 * The copies' results carry no readings (clone-units copies results only): each copy gets the
 * template's readings, so a finding has something measured to sit beside.
 */
async function copyReadings(t: TestApp, template: string, copies: UnitCopy[]) {
  const ids = await t.sequelize.query<{ id: number }>(
    `SELECT id FROM (
       SELECT u.id, 0 AS k FROM items u WHERE u.serial = :template
       UNION ALL
       SELECT l.child_item_id, 1 FROM item_links l JOIN items u ON u.id = l.parent_item_id
        WHERE u.serial = :template AND l.link_type = 'installed_in' AND l.removed_at IS NULL) x
      ORDER BY k, id`,
    { type: QueryTypes.SELECT, replacements: { template } },
  );
  const map = copies.flatMap((c) => {
    const serials = [c.unit, ...c.parts.map((p) => p.serial)];
    return ids.map((row, i) => [row.id, serials[i]!] as const);
  });
  await t.sequelize.query(
    `WITH m AS (SELECT (e->>0)::int AS old_id, i.id AS new_id
                  FROM jsonb_array_elements(CAST(:map AS jsonb)) e JOIN items i ON i.serial = e->>1)
     INSERT INTO readings (stage_result_id, characteristic_id, position, value, passed, location_note, unit, verdict,
                           tolerance_rule_id, rule_version, gauge_id)
     SELECT nr.id, rd.characteristic_id, rd.position, rd.value, rd.passed, rd.location_note, rd.unit, rd.verdict,
            rd.tolerance_rule_id, rd.rule_version, rd.gauge_id
       FROM m JOIN stage_results o ON o.item_id = m.old_id
       JOIN stage_results nr ON nr.item_id = m.new_id AND nr.stage_id = o.stage_id AND nr.finished_at = o.finished_at
       JOIN readings rd ON rd.stage_result_id = o.id`,
    { type: QueryTypes.INSERT, replacements: { map: JSON.stringify(map) } },
  );
}

/**
 * Moves a shipment's ship date back (a fixture: the unit has been in the field since then). The
 * moment it left the dock stays, so what was in it when it shipped is still read as it was.
 */
export async function shippedOn(t: TestApp, unit: string, shipDate: string) {
  await t.sequelize.query(
    `UPDATE shipments SET ship_date = :shipDate
      WHERE unit_item_id = (SELECT id FROM items WHERE serial = :unit) AND returned_at IS NULL`,
    { type: QueryTypes.UPDATE, replacements: { unit, shipDate } },
  );
}

export const claimBody = (unit: string, customerId: number, extra: Record<string, unknown> = {}) => ({
  serial: unit,
  customerId,
  customerReference: 'RMA-77',
  failedOn: plantToday(),
  distanceKm: 42_000,
  symptom: 'Knocks under load once warm, oil light flickers at idle',
  installer: 'Brightwater Garage',
  password: TEST_PASSWORD,
  ...extra,
});

export const post = (t: TestApp, cookie: string, url: string, body: object = {}) =>
  request(t.app).post(url).set('Cookie', cookie).send(body);
export const get = (t: TestApp, cookie: string, url: string) => request(t.app).get(url).set('Cookie', cookie);

/** A claim logged, its unit taken back, ready for teardown. */
export async function returnedClaim(
  t: TestApp,
  people: ClaimPeople,
  unit: string,
  extra: Record<string, unknown> = {},
) {
  const customer = await mailedCustomer();
  const logged = await post(t, people.desk.cookie, '/api/warranty/claims', claimBody(unit, customer.id, extra));
  if (logged.status !== 201) throw new Error(`claim failed: ${JSON.stringify(logged.body)}`);
  const number = logged.body.number as string;
  const back = await post(t, people.receiving.cookie, `/api/warranty/claims/${number}/return`, {
    password: TEST_PASSWORD,
  });
  if (back.status !== 200) throw new Error(`return failed: ${JSON.stringify(back.body)}`);
  return number;
}
