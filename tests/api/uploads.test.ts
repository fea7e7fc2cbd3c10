import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Attachment } from '../../server/models/index.js';
import { claimUploads } from '../../server/services/attachments.js';
import { LocalDiskStore } from '../../server/storage/blob-store.js';
import { cookieFor, makeTestApp, makeUser, type TestApp } from '../support/app.js';
import { elfBytes, htmlBytes, pngImage } from '../support/images.js';

let t: TestApp;
let dir: string;
let uploaderId: number;
let receiving: string;

function filesIn(root: string): string[] {
  if (!fs.existsSync(root)) return [];
  return fs
    .readdirSync(root, { recursive: true, withFileTypes: true })
    .filter((e) => e.isFile())
    .map((e) => e.name);
}

beforeAll(async () => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'coretrail-uploads-'));
  t = makeTestApp({ UPLOAD_DIR: dir });
  const user = await makeUser('receiving');
  uploaderId = user.id;
  receiving = await cookieFor(user, t.config);
});
afterAll(async () => {
  await t.close();
  fs.rmSync(dir, { recursive: true, force: true });
});

async function nothingStored() {
  expect(filesIn(dir)).toEqual([]);
  expect(await Attachment.count({ where: { uploadedById: uploaderId } })).toBe(0);
}

describe('photo uploads are checked by their bytes', () => {
  it('when a program is renamed to .jpg and sent as image/jpeg, then 415 and nothing stored', async () => {
    const res = await request(t.app)
      .post('/api/attachments')
      .set('Cookie', receiving)
      .attach('file', elfBytes(), { filename: 'core-photo.jpg', contentType: 'image/jpeg' });
    expect(res.status).toBe(415);
    expect(res.body.error.code).toBe('not_an_image');
    await nothingStored();
  });

  it('when an HTML page poses as a PNG, then 415 and nothing stored', async () => {
    const res = await request(t.app)
      .post('/api/attachments')
      .set('Cookie', receiving)
      .attach('file', htmlBytes(), { filename: 'photo.png', contentType: 'image/png' });
    expect(res.status).toBe(415);
    await nothingStored();
  });

  it('when the file is over 8 MB, then 413 and nothing stored', async () => {
    const big = Buffer.concat([pngImage(), Buffer.alloc(8 * 1024 * 1024 + 1)]);
    const res = await request(t.app).post('/api/attachments').set('Cookie', receiving).attach('file', big, 'big.png');
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe('too_large');
    await nothingStored();
  });

  it('when the role may not upload, then 403 and nothing stored', async () => {
    const shipping = await cookieFor(await makeUser('shipping'), t.config);
    const res = await request(t.app)
      .post('/api/attachments')
      .set('Cookie', shipping)
      .attach('file', pngImage(), 'p.png');
    expect(res.status).toBe(403);
    await nothingStored();
  });

  it('when no file is sent, then 400 naming the field', async () => {
    const res = await request(t.app).post('/api/attachments').set('Cookie', receiving).field('note', 'x');
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('file');
  });

  it('a real photo is stored under a generated name, outside the served client, and read back by id only', async () => {
    const res = await request(t.app)
      .post('/api/attachments')
      .set('Cookie', receiving)
      .attach('file', pngImage(), { filename: '../../etc/passwd.png', contentType: 'application/octet-stream' });
    expect(res.status).toBe(201);
    expect(res.body.mimeType).toBe('image/png');
    const [stored] = filesIn(dir);
    expect(stored).toMatch(/^[0-9a-f-]{36}\.png$/);
    expect(res.body.fileName).not.toContain('/');
    // pending photos are the uploader's alone
    const other = await cookieFor(await makeUser('quality'), t.config);
    expect((await request(t.app).get(res.body.url).set('Cookie', other)).status).toBe(404);
    const back = await request(t.app).get(res.body.url).set('Cookie', receiving);
    expect(back.status).toBe(200);
    expect(back.headers['x-content-type-options']).toBe('nosniff');
    expect(Buffer.compare(back.body as Buffer, pngImage())).toBe(0);
  });
});

describe('unclaimed uploads and the daily quota', () => {
  it('when a photo has waited unclaimed for over a day, then the sweep removes its file and row; a claimed or fresh one stays', async () => {
    const { sweepUnclaimedUploads } = await import('../../server/jobs/upload-sweeper.js');
    const user = await makeUser('receiving');
    const cookie = await cookieFor(user, t.config);
    const up = async () =>
      (await request(t.app).post('/api/attachments').set('Cookie', cookie).attach('file', pngImage(), 'p.png'))
        .body as {
        id: number;
      };
    const old = await up();
    const fresh = await up();
    const claimed = await up();
    const dayAndAMinute = new Date(Date.now() - 24 * 3600_000 - 60_000);
    await Attachment.update({ createdAt: dayAndAMinute }, { where: { id: [old.id, claimed.id] }, silent: true });
    await Attachment.update({ entity: 'core', entityId: '1' }, { where: { id: claimed.id } });
    const oldKey = (await Attachment.findByPk(old.id))!.storageKey;
    expect(filesIn(dir)).toContain(oldKey);
    await sweepUnclaimedUploads(t.sequelize, new LocalDiskStore(dir));
    expect(await Attachment.findByPk(old.id)).toBeNull();
    expect(filesIn(dir)).not.toContain(oldKey);
    expect(await Attachment.findByPk(fresh.id)).not.toBeNull();
    expect(await Attachment.findByPk(claimed.id)).not.toBeNull();
  });

  it('when a person reaches the daily upload quota, then 429 with a plain message and nothing stored', async () => {
    const quota = makeTestApp({ UPLOAD_DIR: dir, UPLOAD_QUOTA_PER_DAY: 2 }, t.sequelize);
    const user = await makeUser('receiving');
    const cookie = await cookieFor(user, quota.config);
    const up = () =>
      request(quota.app).post('/api/attachments').set('Cookie', cookie).attach('file', pngImage(), 'p.png');
    expect((await up()).status).toBe(201);
    expect((await up()).status).toBe(201);
    const third = await up();
    expect(third.status).toBe(429);
    expect(third.body.error.code).toBe('upload_quota');
    expect(third.body.error.message).toMatch(/2 photos/);
    expect(await Attachment.count({ where: { uploadedById: user.id } })).toBe(2);
  });
});

describe('a photo is never removed while a record claims it (race drill)', () => {
  it('when the sweep and a record claiming an old photo race, then either the claim wins and the photo stays, or the sweep wins and the claim is refused', async () => {
    const { sweepUnclaimedUploads } = await import('../../server/jobs/upload-sweeper.js');
    const user = await makeUser('receiving');
    const cookie = await cookieFor(user, t.config);
    const ctx = { actor: { id: user.id, role: user.role }, requestId: null };
    const store = new LocalDiskStore(dir);
    const outcomes = { claimed: 0, swept: 0 };
    for (let pair = 0; pair < 20; pair++) {
      const up = await request(t.app)
        .post('/api/attachments')
        .set('Cookie', cookie)
        .attach('file', pngImage(), 'r.png');
      const { id } = up.body as { id: number };
      await Attachment.update({ createdAt: new Date(Date.now() - 25 * 3600_000) }, { where: { id }, silent: true });
      const key = (await Attachment.findByPk(id))!.storageKey;
      const wait = () => new Promise((r) => setTimeout(r, Math.random() * 15));
      const [claim] = await Promise.allSettled([
        wait().then(() =>
          t.sequelize.transaction((transaction) => claimUploads(ctx, transaction, [id], 'core', `drill-${pair}`)),
        ),
        wait().then(() => sweepUnclaimedUploads(t.sequelize, store)),
      ]);
      const row = await Attachment.findByPk(id);
      if (claim.status === 'fulfilled') {
        // the claim committed first: the sweep skipped or waited for the row and found it claimed
        outcomes.claimed++;
        expect(row?.entity, `pair ${pair}`).toBe('core');
        expect(filesIn(dir), `pair ${pair}`).toContain(key);
      } else {
        // the sweep committed first: the claim found nothing to attach and said so
        outcomes.swept++;
        expect(row, `pair ${pair}`).toBeNull();
        expect(filesIn(dir), `pair ${pair}`).not.toContain(key);
      }
    }
    expect(outcomes.claimed + outcomes.swept).toBe(20);
  });
});
