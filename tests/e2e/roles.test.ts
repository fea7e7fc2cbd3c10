import type { Browser, Page } from 'playwright-core';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_USERS } from '../../db/seeders/plant.js';
import { can } from '../../shared/permissions.js';
import type { Role } from '../../shared/roles.js';
import { Customer, EngineFamily } from '../../server/models/index.js';
import { cookieFor, makeUser, unique } from '../support/app.js';
import { launch, serveApp, signIn, type Served } from '../support/browser.js';

// What each role sees of the receiving desk follows the permission matrix, screen by screen.
let served: Served;
let browser: Browser;
let coreSerial: string;

beforeAll(async () => {
  served = await serveApp();
  browser = await launch();
  const cookie = await cookieFor(await makeUser('receiving'), served.t.config);
  const v8 = (await EngineFamily.findOne({ where: { code: 'CORRIE-8' } }))!;
  const res = await request(served.t.app)
    .post('/api/cores')
    .set('Cookie', cookie)
    .send({
      familyId: v8.id,
      castingNumber: 'CV8 4471-B',
      idNumber: unique('ROLE').toUpperCase(),
      source: 'customer_return',
      customerId: (await Customer.findOne())!.id,
      sourceReference: unique('RMA-'),
      receivedOn: new Date().toISOString().slice(0, 10),
      complete: true,
      grade: 'sound',
      accepted: true,
      creditDecision: 'full',
    });
  coreSerial = res.body.serial;
});
afterAll(async () => {
  await browser?.close();
  await served?.close();
});

const nav = (page: Page) => page.getByRole('navigation', { name: 'Main' });

describe('each role sees what the matrix allows', () => {
  for (const role of ['receiving', 'operator', 'quality', 'warranty'] as Role[]) {
    it(`${role}`, async () => {
      const demo = DEMO_USERS.find((u) => u.role === role)!;
      const page = await browser.newPage({ viewport: { width: 1024, height: 768 } });
      await signIn(page, served.base, demo.email, demo.password);
      const links = await nav(page).getByRole('link').allTextContents();
      expect(
        links.some((l) => l.includes('Intake')),
        'Intake in nav',
      ).toBe(can(role, 'intake.read'));
      expect(
        links.some((l) => l.includes('Teardown')),
        'Teardown in nav',
      ).toBe(can(role, 'teardown.record'));
      if (can(role, 'intake.read')) {
        await page.goto(`${served.base}/intake`);
        await page.getByRole('heading', { level: 1 }).first().waitFor();
        expect(await page.getByRole('link', { name: 'Receive a core' }).count(), 'Receive a core').toBe(
          can(role, 'intake.record') ? 1 : 0,
        );
        await page.goto(`${served.base}/cores/${coreSerial}`);
        await page.getByText(coreSerial).first().waitFor();
        expect(await page.getByRole('link', { name: 'Tear down' }).count(), 'Tear down').toBe(
          can(role, 'teardown.record') ? 1 : 0,
        );
      }
      await page.close();
    });
  }
});

describe('teardown starts from what intake found', () => {
  it('an operator, who cannot read the receipt, still sees a part recorded missing and its row set to not there', async () => {
    const cookie = await cookieFor(await makeUser('receiving'), served.t.config);
    const v8 = (await EngineFamily.findOne({ where: { code: 'CORRIE-8' } }))!;
    const res = await request(served.t.app)
      .post('/api/cores')
      .set('Cookie', cookie)
      .send({
        familyId: v8.id,
        castingNumber: 'CV8 4471-B',
        idNumber: unique('MISS').toUpperCase(),
        source: 'customer_return',
        customerId: (await Customer.findOne())!.id,
        sourceReference: unique('RMA-'),
        receivedOn: new Date().toISOString().slice(0, 10),
        complete: false,
        missing: ['crankshaft'],
        grade: 'doubtful',
        accepted: true,
        creditDecision: 'partial',
        creditReason: 'Crankshaft missing',
      });
    expect(res.status).toBe(201);
    const demo = DEMO_USERS.find((u) => u.role === 'operator')!;
    const page = await browser.newPage({ viewport: { width: 1024, height: 768 } });
    await signIn(page, served.base, demo.email, demo.password);
    await page.goto(`${served.base}/teardown?serial=${res.body.serial}`);
    await page.getByText('Recorded missing at intake').first().waitFor();
    expect(await page.getByRole('radio', { name: 'Crankshaft not there' }).isChecked()).toBe(true);
    expect(await page.getByRole('radio', { name: 'Keep Block' }).isChecked()).toBe(false);
    await page.close();
  });
});
