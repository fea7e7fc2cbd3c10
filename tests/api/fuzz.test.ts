import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import fc from 'fast-check';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent, Customer, DefectCode, EngineFamily } from '../../server/models/index.js';
import { can } from '../../shared/permissions.js';
import { ROLES, type Role } from '../../shared/roles.js';
import { cookieFor, makeTestApp, makeUser, type TestApp } from '../support/app.js';
import {
  describeSchema,
  hostile,
  hostileContentType,
  hostileParam,
  leafPaths,
  oddButValid,
  plausible,
  plausiblePool,
  setAt,
  type Node,
} from '../support/fuzz.js';
import { pngImage } from '../support/images.js';
import { tornDownCore } from '../support/parts.js';

// Every route in the registry, sent near-valid input with at least one value that must be refused
// (property-based, fixed seed, a bounded count): no reply may be a 5xx, and no request may write
// (every write records an audit event in its own transaction, tagged with the request id).
const SEED = 20261214;
const RUNS_PER_ROUTE = 40;
const UPLOAD_RUNS = 60;

let t: TestApp;
let dir: string;
const cookies = new Map<Role, string>();
let pool: unknown[] = [];
const ids: Record<string, string[]> = {};
let sent = 0;
let tabletCookie = '';
// request ids are unique to this run, so an event from an earlier run on the same database never counts
const RUN = Math.random().toString(36).slice(2, 8);

beforeAll(async () => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'coretrail-fuzz-'));
  t = makeTestApp({ UPLOAD_DIR: dir });
  const users = new Map<Role, Awaited<ReturnType<typeof makeUser>>>();
  for (const role of ROLES) {
    const u = await makeUser(role);
    users.set(role, u);
    cookies.set(role, await cookieFor(u, t.config));
  }
  // records of this file's own to aim at: a core torn down into parts, and its people
  const parts = await tornDownCore(
    t,
    { receiving: cookies.get('receiving')!, operator: cookies.get('operator')! },
    'TARN-6',
  );
  const family = (await EngineFamily.findOne({ where: { code: 'TARN-6' } }))!;
  const customer = (await Customer.findOne())!;
  const defect = (await DefectCode.findOne({ where: { active: true } }))!;
  const ncr = await request(t.app).post('/api/ncrs').set('Cookie', cookies.get('operator')!).send({
    serial: parts.crankshaft,
    description: 'Scored journal, for the fuzz suite',
    severity: 'minor',
    defectCode: defect.code,
  });
  if (ncr.status !== 201) throw new Error(`raise failed: ${JSON.stringify(ncr.body)}`);
  ids.serial = [parts.core, parts.block, parts.crankshaft];
  // ids of this file's own records only: a mistaken acceptance must not change what other files use
  ids.id = [String(users.get('operator')!.id)];
  ids.code = ['BH-1', defect.code];
  ids.number = [ncr.body.number as string];
  ids.lotCode = ['T-PISTONS'];
  ids.characteristicId = ['1'];
  // a shared tablet of this file's own, enrolled by an admin, for the routes only a tablet may call
  const enrol = await request(t.app)
    .post('/api/tablets')
    .set('Cookie', cookies.get('admin')!)
    .send({ station: 'BH-1', label: 'Fuzz tablet' });
  if (enrol.status !== 201) throw new Error(`enrol failed: ${JSON.stringify(enrol.body)}`);
  tabletCookie = (enrol.headers['set-cookie'] as unknown as string[])
    .find((c) => c.startsWith('coretrail_tablet='))!
    .split(';')[0]!;
  pool = plausiblePool([...ids.serial, ...ids.code], [family.id, customer.id, 1, 2, 8, 0.0197, 4.03, 25]);
});
afterAll(async () => {
  await t.close();
  fs.rmSync(dir, { recursive: true, force: true });
});

type Req = { url: string; query: Record<string, unknown>; body: unknown; contentType?: string; what: string };

function roleFor(access: string): Role | null {
  if (access === 'public' || access === 'tablet') return null;
  if (access === 'signed-in') return 'operator';
  return ROLES.find((r) => can(r, access as never)) ?? 'admin';
}

/** One request to a route with at least one value that must be refused, placed at random. */
function requests(route: (typeof t.app.apiRoutes)[number]): fc.Arbitrary<Req> {
  const params = [...route.path.matchAll(/:([a-zA-Z]+)/g)].map((m) => m[1]!);
  const query = route.input.query ? describeSchema(route.input.query as never) : null;
  const body = route.input.body ? describeSchema(route.input.body as never) : null;
  const write = route.method !== 'get';

  const pathWith = (hostileAt: string | null) =>
    fc
      .tuple(
        ...params.map((p) =>
          p === hostileAt ? hostileParam : fc.oneof(...(ids[p] ?? ['1']).map((id) => oddButValid(id))),
        ),
      )
      .map((values) => params.reduce((u, p, i) => u.replace(`:${p}`, values[i] as string), route.path));
  const base = (node: Node | null, q: boolean) =>
    node ? plausible(node, pool, q) : fc.constant({} as Record<string, unknown>);
  const mutated = (node: Node, q: boolean) =>
    fc.tuple(base(node, q), fc.constantFrom(...leafPaths(node))).chain(([value, leaf]) =>
      hostile(leaf.node, q).map((bad) => {
        const copy = structuredClone(value) as Record<string, unknown>;
        return { value: setAt(copy, leaf.path, bad) as Record<string, unknown>, at: leaf.path.join('.') || '(all)' };
      }),
    );

  const slots: fc.Arbitrary<Req>[] = [];
  for (const p of params) {
    slots.push(
      fc
        .tuple(pathWith(p), base(query, true), base(body, false))
        .map(([url, q, b]) => ({ url, query: q as never, body: b, what: `path :${p}` })),
    );
  }
  if (query && leafPaths(query).length) {
    slots.push(
      fc
        .tuple(pathWith(null), mutated(query, true), base(body, false))
        .map(([url, q, b]) => ({ url, query: q.value, body: b, what: `query ${q.at}` })),
    );
  }
  slots.push(
    fc.tuple(pathWith(null), base(query, true), fc.string({ minLength: 1, maxLength: 12 })).map(([url, q, k]) => ({
      url,
      query: { ...(q as object), [`zz${k}`]: '1' },
      body: {},
      what: 'unknown query key',
    })),
  );
  if (write) {
    if (body && leafPaths(body).length) {
      slots.push(
        fc
          .tuple(pathWith(null), base(query, true), mutated(body, false))
          .map(([url, q, b]) => ({ url, query: q as never, body: b.value, what: `body ${b.at}` })),
      );
    }
    slots.push(
      fc.tuple(pathWith(null), base(body, false), fc.string({ minLength: 1, maxLength: 12 })).map(([url, b, k]) => ({
        url,
        query: {},
        body: { ...(b as object), [`zz${k}`]: true },
        what: 'unknown body key',
      })),
    );
    slots.push(
      fc.tuple(pathWith(null), base(body, false), hostileContentType).map(([url, b, contentType]) => ({
        url,
        query: {},
        body: b,
        contentType,
        what: `content type ${contentType}`,
      })),
    );
  }
  return fc.oneof(...slots);
}

type Finding = { route: string; what: string; url: string; status: number; wrote: number; body: string };

async function send(route: (typeof t.app.apiRoutes)[number], r: Req): Promise<Finding | null> {
  const role = roleFor(route.access);
  // routes that end the caller's session get a session of their own each time
  const fresh = /\/auth\/(logout|password)|end-others/.test(route.path);
  const cookie =
    route.access === 'tablet'
      ? tabletCookie
      : role
        ? fresh
          ? await cookieFor(await makeUser(role), t.config)
          : cookies.get(role)!
        : undefined;
  const requestId = `fuzz-${RUN}-${sent++}`;
  const qs = new URLSearchParams();
  for (const [k, v] of Object.entries(r.query)) for (const one of [v].flat()) qs.append(k, String(one));
  const url = qs.size ? `${r.url}?${qs}` : r.url;
  let req = request(t.app)[route.method](url).set('X-Request-Id', requestId);
  if (cookie) req = req.set('Cookie', cookie);
  if (route.method !== 'get') {
    if (r.contentType) req = req.set('Content-Type', r.contentType).send(JSON.stringify(r.body));
    else req = req.send(r.body as object);
  }
  const res = await req;
  const wrote = await AuditEvent.count({ where: { requestId } });
  if (res.status < 500 && wrote === 0) return null;
  return {
    route: `${route.method.toUpperCase()} ${route.path}`,
    what: r.what,
    url,
    status: res.status,
    wrote,
    body: res.text.slice(0, 200),
  };
}

describe('the fuzz suite: hostile input on every route', () => {
  it(`when every route gets ${RUNS_PER_ROUTE} generated bad requests, then none is a 5xx and none writes`, async () => {
    const findings: Finding[] = [];
    const routes = t.app.apiRoutes.filter((r) => !r.input.multipart);
    for (const [i, route] of routes.entries()) {
      const samples = fc.sample(requests(route), { seed: SEED + i, numRuns: RUNS_PER_ROUTE });
      for (const r of samples) {
        const f = await send(route, r);
        if (f) findings.push(f);
      }
    }
    if (process.env.FUZZ_REPORT) fs.writeFileSync(process.env.FUZZ_REPORT, JSON.stringify({ sent, findings }, null, 2));
    expect(findings, `${findings.length} of ${sent} requests`).toEqual([]);
  }, 240_000);

  it(`when photos with ${UPLOAD_RUNS} generated names and broken multipart bodies are sent, then none is a 5xx and every stored photo reads back`, async () => {
    const cookie = cookies.get('receiving')!;
    const findings: string[] = [];
    const names = fc.sample(fc.string({ unit: 'binary', minLength: 1, maxLength: 40 }), {
      seed: SEED,
      numRuns: UPLOAD_RUNS,
    });
    for (const name of names) {
      const up = await request(t.app)
        .post('/api/attachments')
        .set('Cookie', cookie)
        .attach('file', pngImage(8, 8), { filename: name.replace(/[\r\n"]/g, '_'), contentType: 'image/png' });
      sent++;
      if (up.status >= 500) findings.push(`upload ${JSON.stringify(name)} → ${up.status}`);
      if (up.status !== 201) continue;
      const back = await request(t.app).get(up.body.url).set('Cookie', cookie);
      sent++;
      if (back.status !== 200) findings.push(`read back ${JSON.stringify(name)} → ${back.status}`);
    }
    const broken = fc.sample(
      fc.record({
        type: fc.constantFrom(
          'multipart/form-data',
          'multipart/form-data; boundary=b',
          'multipart/form-data; boundary="',
        ),
        cut: fc.integer({ min: 0, max: 120 }),
      }),
      { seed: SEED, numRuns: UPLOAD_RUNS },
    );
    for (const { type, cut } of broken) {
      const whole = Buffer.concat([
        Buffer.from(
          '--b\r\nContent-Disposition: form-data; name="file"; filename="p.png"\r\nContent-Type: image/png\r\n\r\n',
        ),
        pngImage(8, 8),
        Buffer.from('\r\n--b--\r\n'),
      ]);
      const requestId = `fuzz-${RUN}-mp-${sent++}`;
      const res = await request(t.app)
        .post('/api/attachments')
        .set('Cookie', cookie)
        .set('X-Request-Id', requestId)
        .set('Content-Type', type)
        .send(whole.subarray(0, cut));
      const wrote = await AuditEvent.count({ where: { requestId } });
      if (res.status >= 500 || wrote) findings.push(`multipart ${type} cut at ${cut} → ${res.status}, wrote ${wrote}`);
    }
    expect(findings).toEqual([]);
  }, 120_000);
});
