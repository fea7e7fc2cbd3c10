import { Op } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent, Customer, Supplier } from '../../server/models/index.js';
import { cookieFor, makeTestApp, makeUser, unique, type TestApp } from '../support/app.js';

let t: TestApp;
let admin: string;
let quality: string;
let receiving: string;

beforeAll(async () => {
  t = makeTestApp();
  admin = await cookieFor(await makeUser('admin'), t.config);
  quality = await cookieFor(await makeUser('quality'), t.config);
  receiving = await cookieFor(await makeUser('receiving'), t.config);
});
afterAll(() => t.close());

const code = () =>
  `P${unique('')
    .replace(/[^a-z0-9]/gi, '')
    .slice(0, 10)
    .toUpperCase()}`;

describe('the plant adds its own customers and suppliers', () => {
  it('when an administrator adds a customer, then it is listed, audited, and its code cannot be taken again', async () => {
    const c = code();
    const res = await request(t.app)
      .post('/api/customers')
      .set('Cookie', admin)
      .send({ code: c.toLowerCase(), name: '  Harbour Fleet Works ', email: 'Orders@Harbour.example' });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body).toMatchObject({ code: c, name: 'Harbour Fleet Works', email: 'orders@harbour.example' });
    const list = await request(t.app).get('/api/customers').set('Cookie', receiving);
    expect(list.body).toContainEqual({ id: res.body.id, code: c, name: 'Harbour Fleet Works' });
    const events = await AuditEvent.findAll({ where: { entity: 'customer', entityId: String(res.body.id) } });
    expect(events.map((e) => e.action)).toEqual(['customer.created']);

    const again = await request(t.app).post('/api/customers').set('Cookie', quality).send({ code: c, name: 'Other' });
    expect(again.status).toBe(409);
    expect(again.body.error.message).toBe(`There is already a customer with code ${c}.`);
    expect(await Customer.count({ where: { code: c } })).toBe(1);
  });

  it('when quality adds a supplier without an e-mail, then it is kept with none, and the same code may name a customer too', async () => {
    const c = code();
    expect(
      (await request(t.app).post('/api/customers').set('Cookie', admin).send({ code: c, name: 'Both ways' })).status,
    ).toBe(201);
    const res = await request(t.app)
      .post('/api/suppliers')
      .set('Cookie', quality)
      .send({ code: c, name: 'Ridgeway Ring & Bearing', email: '' });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.email).toBeNull();
    const list = await request(t.app).get('/api/suppliers').set('Cookie', receiving);
    expect(list.body).toContainEqual({ id: res.body.id, code: c, name: 'Ridgeway Ring & Bearing' });
    const events = await AuditEvent.findAll({ where: { entity: 'supplier', entityId: String(res.body.id) } });
    expect(events.map((e) => e.action)).toEqual(['supplier.created']);
  });

  it('when the input is bad or the role may not add them, then the reply says so and nothing is written', async () => {
    // only the rows and events these requests could have written: other files write theirs at the same time
    const tried = ['x', code(), code()];
    const written = async () => [
      await Customer.count({ where: { code: tried } }),
      await Supplier.count({ where: { code: tried } }),
      await AuditEvent.count({ where: { entity: ['customer', 'supplier'], after: { code: { [Op.in]: tried } } } }),
    ];
    const before = await written();
    expect(before).toEqual([0, 0, 0]);
    const bad = await request(t.app)
      .post('/api/suppliers')
      .set('Cookie', admin)
      .send({ code: 'x', name: 'A', email: 'not an address' });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(['code', 'email', 'name']);
    const extra = await request(t.app)
      .post('/api/customers')
      .set('Cookie', admin)
      .send({ code: tried[1], name: 'Extra', credit: 5 });
    expect(extra.status).toBe(400);
    const refused = await request(t.app)
      .post('/api/customers')
      .set('Cookie', receiving)
      .send({ code: tried[2], name: 'Nope' });
    expect(refused.status).toBe(403);
    expect(await written()).toEqual(before);
  });
});
