import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { randomUUID } from 'node:crypto';
import { PDFParse } from 'pdf-parse';
import type { Browser, Page } from 'playwright-core';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { nominalSizeClasses, passingReadings } from '../../db/seeders/sample-readings.js';
import { DEMO_USERS } from '../../db/seeders/plant.js';
import { readMailSink, startMailSink } from '../../server/mail/sink.js';
import { LOT_KIND_LABELS } from '../../shared/schemas/build.js';
import { Item, ItemLink, Nonconformance, Shipment, User } from '../../server/models/index.js';
import { cookieFor, signInCookie, type TestApp } from '../support/app.js';
import { deliverMailSince, launch, newestMailId, serveApp, signIn, type Served } from '../support/browser.js';
import { fillPassing } from '../support/station-ui.js';
import {
  BLOCK_STATIONS,
  CRANK_STATIONS,
  HEAD_STATIONS,
  finishedParts,
  formFor,
  gaugesOf,
  lotsFor,
  pass,
  passThrough,
  plantToday,
  tornDownCore,
} from '../support/parts.js';

let served: Served;
let t: TestApp;
let browser: Browser;
let cookies: { receiving: string; operator: string };
let sink: Awaited<ReturnType<typeof startMailSink>>;
let firstMail: string;
const shots = path.resolve('test-results/e2e');
const demo = (role: string) => DEMO_USERS.find((u) => u.role === role)!;

beforeAll(async () => {
  served = await serveApp();
  t = served.t;
  browser = await launch();
  fs.mkdirSync(shots, { recursive: true });
  // the demo people do the work, so the messages go to their addresses
  cookies = {
    receiving: await signInCookie(t, demo('receiving').email, demo('receiving').password),
    operator: await signInCookie(t, demo('operator').email, demo('operator').password),
  };
  sink = await startMailSink({ port: 0, dir: fs.mkdtempSync(path.join(os.tmpdir(), 'coretrail-e2e-sink-')) });
  firstMail = await newestMailId(t.sequelize);
});
afterAll(async () => {
  await sink?.close();
  await browser?.close();
  await served?.close();
});

async function page(role: string, width = 1440, height = 900): Promise<Page> {
  const context = await browser.newContext({ viewport: { width, height }, acceptDownloads: true });
  const p = await context.newPage();
  await signIn(p, served.base, demo(role).email, demo(role).password);
  return p;
}

async function atStation(p: Page, station: string, serial: string) {
  await p.goto(`${served.base}/station`);
  await p.evaluate((s) => localStorage.setItem('coretrail.station', s), station);
  await p.goto(`${served.base}/station?serial=${serial}`);
}

describe('the line, end to end', () => {
  it('a failing bore opens an NCR; quality signs a rework; the re-honed block passes and the NCR closes; the unit is released; the mail arrives', async () => {
    // the parts of one Tarn six; the block fails bore and hone on cylinder 4
    const parts = await tornDownCore(t, cookies, 'TARN-6');
    await passThrough(t, cookies.operator, BLOCK_STATIONS.slice(0, 4), parts.block);
    const form = await formFor(t, cookies.operator, 'BH-1', parts.block);
    const failed = await request(t.app)
      .post('/api/results')
      .set('Cookie', cookies.operator)
      .send({
        idempotencyKey: randomUUID(),
        serial: parts.block,
        station: 'BH-1',
        ...gaugesOf(form),
        readings: passingReadings(form, (c, p, v) => (c === 'bore' && p === 'c4/bottom/thrust' ? 3.7213 : v)),
        sizeClasses: nominalSizeClasses(form),
      });
    const number = failed.body.nonconformance.number as string;

    // quality reviews it and decides rework at bore and hone, signing with the password
    const q = await page('quality');
    await q.goto(`${served.base}/ncrs/${number}`);
    await q.getByRole('button', { name: 'Start review' }).click();
    await q.getByRole('radio', { name: 'Rework' }).check();
    await q.getByLabel('Rework stage').selectOption('bore-hone');
    await q.getByRole('textbox', { name: 'Reason' }).fill('Re-hone cylinder 4 to size; within the oversize');
    await q.getByLabel('Password').fill(demo('quality').password);
    await q.getByRole('button', { name: 'Sign decision' }).click();
    await q.getByText('Decided').first().waitFor();
    await q.screenshot({ path: path.join(shots, 'ncr-decided-1440.png'), fullPage: true });

    // the operator re-hones and records it on the tablet
    const o = await page('operator', 1024, 768);
    await atStation(o, 'BH-1', parts.block);
    await o.getByRole('textbox', { name: 'Cylinder bore diameter, Cylinder 1, top, thrust' }).waitFor();
    const due = await formFor(t, cookies.operator, 'BH-1', parts.block);
    await fillPassing(o, due);
    await o.getByRole('button', { name: 'Record result' }).click();
    await o.getByRole('heading', { level: 2, name: 'Passed' }).waitFor();
    const ncr = (await Nonconformance.findOne({ where: { number } }))!;
    expect(ncr.state).toBe('closed');
    await q.reload();
    await q.getByText('Closed').first().waitFor();

    // the rest of the route, the build, assembly, run test and final inspection
    await passThrough(t, cookies.operator, BLOCK_STATIONS.slice(5), parts.block);
    await passThrough(t, cookies.operator, CRANK_STATIONS, parts.crankshaft);
    await passThrough(t, cookies.operator, HEAD_STATIONS, parts.heads[0]!);
    const built = await request(t.app)
      .post('/api/units')
      .set('Cookie', cookies.operator)
      .send({
        family: 'TARN-6',
        block: parts.block,
        crankshaft: parts.crankshaft,
        heads: parts.heads,
        lots: await lotsFor(0.0197, 'E2E'),
      });
    const unit = built.body.serial as string;
    await passThrough(t, cookies.operator, ['AS-1', 'RT-1', 'FI-1'], unit);
    // a concern on the crankshaft holds the finished unit; voiding it tells shipping it can go
    const concern = await request(t.app).post('/api/ncrs').set('Cookie', cookies.operator).send({
      serial: parts.crankshaft,
      description: 'Rust bloom on the snout seen while crating',
      severity: 'minor',
      defectCode: 'DMG',
    });
    const s = await page('shipping');
    await s.goto(`${served.base}/release?serial=${unit}`);
    await s.getByText(`${concern.body.number} is open on ${parts.crankshaft}.`).waitFor();
    const qc = await cookieFor((await User.findOne({ where: { email: demo('quality').email } }))!, t.config);
    await request(t.app)
      .post(`/api/ncrs/${concern.body.number}/void`)
      .set('Cookie', qc)
      .send({ reason: 'Surface oil film, wiped off' });

    await s.reload();
    await s.getByLabel('Customer').selectOption({ index: 1 });
    const order = `SO-E2E-${randomUUID().slice(0, 6)}`;
    await s.getByLabel('Order reference').fill(order);
    // release is a signed act: the shipper's own password, under the meaning it carries
    await s.getByText('released for shipment').first().waitFor();
    await s.getByLabel('Password').fill(demo('shipping').password);
    await s.getByRole('button', { name: 'Sign, release and ship' }).click();
    await s.getByText(order).first().waitFor();
    await s.screenshot({ path: path.join(shots, 'released-1440.png'), fullPage: true });
    expect((await Shipment.findOne({ where: { reference: order } }))!.unitItemId).toBe(
      (await Item.findOne({ where: { serial: unit } }))!.id,
    );

    // the mail, as the loopback sink received it
    // what was queued since this file began for the demo people, and only that: the other suites
    // share the outbox
    await deliverMailSince(
      t.sequelize,
      sink.port,
      firstMail,
      DEMO_USERS.map((u) => u.email),
    );
    const got = readMailSink(sink.dir, Number.MAX_SAFE_INTEGER);
    const to = (addr: string, subject: string | RegExp) =>
      got.filter(
        (m) => m.to.includes(addr) && (typeof subject === 'string' ? m.subject === subject : subject.test(m.subject)),
      );
    expect(to(demo('quality').email, `NCR ${number} raised on ${parts.block}`)).toHaveLength(1);
    expect(to(demo('operator').email, `NCR ${number} on ${parts.block}: Rework`)).toHaveLength(1);
    expect(to(demo('shipping').email, `${unit} can ship: nothing holds it any more`)).toHaveLength(1);
    expect(to(demo('shipping').email, /can ship/)[0]!.text).toContain(`/release?serial=${unit}`);
  }, 180_000);

  it('a long block built at the bench from finished parts and lots, released, then looked up by the warranty desk', async () => {
    const parts = await finishedParts(t, cookies, 'TARN-6');
    const op = await page('operator', 1024, 768);
    await op.goto(`${served.base}/build`);
    await op
      .getByLabel('Engine family')
      .selectOption({ label: 'TARN-6 — Tarn inline six' })
      .catch(async () => {
        await op.getByLabel('Engine family').selectOption({ index: 1 });
      });
    const fill = async (name: string, serial: string) => {
      const box = op.getByRole('textbox', { name, exact: true });
      await box.fill(serial);
      await box.press('Enter');
    };
    await fill('Block', parts.block);
    await fill('Crankshaft', parts.crankshaft);
    await fill('Cylinder head', parts.heads[0]!);
    const lots = await lotsFor(0.0197, 'WD');

    for (const l of lots) {
      await op.getByLabel(`${LOT_KIND_LABELS[l.kind]} supplier`).selectOption(String(l.supplierId));
      await op.getByLabel(`${LOT_KIND_LABELS[l.kind]} part number`).fill(l.partNumber);
      await op.getByLabel(`${LOT_KIND_LABELS[l.kind]} lot code`).fill(l.lotCode);
      if (l.sizeClass) await op.getByLabel(`${LOT_KIND_LABELS[l.kind]} size class`).fill(l.sizeClass);
    }
    await op.getByLabel('Pistons oversize (in)').fill('0.0197');
    await op.getByRole('button', { name: 'Start long block' }).click();
    const unit = await (async () => {
      for (let i = 0; i < 50; i++) {
        // the unit this block went into, by genealogy: other suites build long blocks at the same time
        const installed = await Item.findOne({ where: { serial: parts.block } });
        const link = installed
          ? await ItemLink.findOne({
              where: { childItemId: installed.id, linkType: 'installed_in', removedAt: null },
            })
          : null;
        const u = link ? await Item.findByPk(link.parentItemId) : null;
        if (u && installed?.status === 'installed') return u.serial;
        await new Promise((r) => setTimeout(r, 100));
      }
      throw new Error('no unit');
    })();
    await op.getByText(unit).first().waitFor();
    await op.screenshot({ path: path.join(shots, 'built-1024.png'), fullPage: true });

    // assembly on the tablet: torques, clearances, ring gaps, cam timing
    await atStation(op, 'AS-1', unit);
    await op.getByRole('textbox', { name: 'Main cap bolt torque, Main 1', exact: true }).waitFor();
    await expect(
      op
        .getByText(/never reused/)
        .first()
        .isVisible(),
    ).resolves.toBe(true);
    await fillPassing(op, await formFor(t, cookies.operator, 'AS-1', unit));
    await op.getByRole('button', { name: 'Record result' }).click();
    await op.getByRole('heading', { level: 2, name: 'Passed' }).waitFor();
    await op.getByText('Next stage: Run test').waitFor();
    // the run test from the stand's CSV export, on the tablet
    await atStation(op, 'RT-1', unit);
    const csv = path.join(os.tmpdir(), `run-${unit}.csv`);
    fs.writeFileSync(
      csv,
      [
        'channel,cylinder,value,unit',
        'OIL_P_IDLE,,22,psi',
        'OIL_P_2500,,48,psi',
        ...[1, 2, 3, 4, 5, 6].map((c) => `COMP,${c},${160 - c},psi`),
        'LEAK,,PASS,',
        'NOISE,,PASS,',
      ].join('\n'),
    );
    await op.getByLabel('Test stand CSV').setInputFiles(csv);
    await op.getByRole('button', { name: 'Read the file' }).click();
    await op.getByText(/readings filled from/).waitFor();
    await op.getByRole('button', { name: 'Record result' }).click();
    await op.getByRole('heading', { level: 2, name: 'Passed' }).waitFor();
    await pass(t, cookies.operator, 'FI-1', unit);
    const shipping = await signInCookie(t, demo('shipping').email, demo('shipping').password);
    const customer = (await import('../../server/models/index.js')).Customer;
    const rel = await request(t.app)
      .post(`/api/units/${unit}/release`)
      .set('Cookie', shipping)
      .send({
        customerId: (await customer.findOne())!.id,
        reference: 'SO-WD-1',
        shipDate: plantToday(),
        password: demo('shipping').password,
      });
    expect(rel.status).toBe(201);

    // the warranty desk scans the unit's label and reads the whole story
    const w = await page('warranty');
    await w.goto(`${served.base}/trail`);
    const box = w.getByRole('textbox', { name: 'Serial' });
    await box.fill(unit);
    await box.press('Enter');
    await w.getByText('In warranty').first().waitFor();
    for (const serial of [parts.block, parts.crankshaft, parts.heads[0]!, parts.core]) {
      await expect(
        w
          .getByRole('link', { name: new RegExp(serial) })
          .first()
          .isVisible(),
      ).resolves.toBe(true);
    }
    await expect(w.getByText('SO-WD-1').first().isVisible()).resolves.toBe(true);
    await w.screenshot({ path: path.join(shots, 'trail-1440.png'), fullPage: true });

    // the build record, as the desk would download it
    const pdf = await w.request.get(`${served.base}/api/units/${unit}/build-record.pdf`);
    expect(pdf.headers()['content-type']).toBe('application/pdf');
    const text = (await new PDFParse({ data: new Uint8Array(await pdf.body()) }).getText()).text;
    for (const s of [unit, parts.block, parts.core, 'SO-WD-1', 'Compression', 'WD-PISTONS']) expect(text).toContain(s);
  }, 180_000);
});
