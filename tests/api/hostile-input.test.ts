import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Attachment, AuditEvent, User } from '../../server/models/index.js';
import { cookieFor, makeTestApp, makeUser, unique, type TestApp } from '../support/app.js';
import { pngImage } from '../support/images.js';
import { finishedParts, lotsFor } from '../support/parts.js';

// Each case here was a 500 (or a silently changed value) found by probing the running product.
let t: TestApp;
let dir: string;
let admin: string;
let receiving: string;
let receivingId: number;
let operator: string;
let intake: string;

beforeAll(async () => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'coretrail-hostile-'));
  t = makeTestApp({ UPLOAD_DIR: dir });
  admin = await cookieFor(await makeUser('admin'), t.config);
  const receiver = await makeUser('receiving');
  receivingId = receiver.id;
  receiving = await cookieFor(receiver, t.config);
  operator = await cookieFor(await makeUser('operator'), t.config);
  intake = receiving;
});
afterAll(async () => {
  await t.close();
  fs.rmSync(dir, { recursive: true, force: true });
});

/** A JPEG by its first bytes with a web page inside: what a polyglot upload looks like. */
const jpegWithHtml = () =>
  Buffer.concat([
    Buffer.from([0xff, 0xd8, 0xff, 0xe0, 0x00, 0x10, 0x4a, 0x46, 0x49, 0x46, 0x00, 0x01, 0x01, 0x00, 0, 1, 0, 1, 0, 0]),
    Buffer.from('<html><body><script>alert(document.cookie)</script></body></html>'),
    Buffer.from([0xff, 0xd9]),
  ]);

describe('a malformed path is a 400, never a 500', () => {
  it('when a path parameter holds a bad percent-escape, then 400 malformed_path, signed in or not', async () => {
    for (const cookie of [admin, undefined]) {
      for (const url of ['/api/items/%', '/api/people/%E0%A4%A', '/api/ncrs/NC-%zz/review']) {
        const req = url.endsWith('review') ? request(t.app).post(url).send({}) : request(t.app).get(url);
        if (cookie) req.set('Cookie', cookie);
        const res = await req;
        expect(res.status, url).toBe(400);
        expect(res.body.error.code, url).toBe('malformed_path');
      }
    }
  });
});

describe('uploads with awkward names and bodies', () => {
  it('when a photo is named outside Latin-1, then it is stored and reads back with an RFC 8187 file name', async () => {
    const up = await request(t.app)
      .post('/api/attachments')
      .set('Cookie', receiving)
      .attach('file', pngImage(), { filename: 'трещина — блок №2 🔧.png', contentType: 'image/png' });
    expect(up.status).toBe(201);
    const back = await request(t.app).get(up.body.url).set('Cookie', receiving);
    expect(back.status).toBe(200);
    // RFC 8187 §3.2.1: ext-value = charset "'" [ language ] "'" value-chars, UTF-8 percent-encoded
    expect(back.headers['content-disposition']).toMatch(/^inline; filename="[^"]*"; filename\*=UTF-8''[\w%.-]+$/);
    expect(back.headers['content-disposition']).toContain(encodeURIComponent('трещина'));
    // the kept name: NFKC makes № "No" (Unicode's compatibility mapping); a dash or emoji becomes _
    expect(up.body.fileName).toBe('трещина _ блок No2 _.png');
  });

  it('when a JPEG carries a web page and the name poly.html, then it is stored as poly.jpg', async () => {
    const up = await request(t.app)
      .post('/api/attachments')
      .set('Cookie', receiving)
      .attach('file', jpegWithHtml(), { filename: 'poly.html', contentType: 'text/html' });
    expect(up.status).toBe(201);
    expect(up.body.mimeType).toBe('image/jpeg');
    expect(up.body.fileName).toBe('poly.jpg');
  });

  it('when a multipart body has no boundary or is cut short, then 400 invalid_upload naming the file', async () => {
    // this file's uploader only: other files upload at the same time
    const before = await Attachment.count({ where: { uploadedById: receivingId } });
    const noBoundary = await request(t.app)
      .post('/api/attachments')
      .set('Cookie', receiving)
      .set('Content-Type', 'multipart/form-data')
      .send('--x\r\nContent-Disposition: form-data; name="file"; filename="a.png"\r\n\r\nabc\r\n--x--\r\n');
    expect(noBoundary.status).toBe(400);
    expect(noBoundary.body.error.code).toBe('invalid_upload');
    expect(noBoundary.body.error.fields).toHaveProperty('file');
    const cut = await request(t.app)
      .post('/api/attachments')
      .set('Cookie', receiving)
      .set('Content-Type', 'multipart/form-data; boundary=XyZ')
      .send(
        Buffer.concat([
          Buffer.from('--XyZ\r\nContent-Disposition: form-data; name="file"; filename="a.png"\r\n'),
          Buffer.from('Content-Type: image/png\r\n\r\n'),
          pngImage().subarray(0, 40),
        ]),
      );
    expect(cut.status).toBe(400);
    expect(cut.body.error.code).toBe('invalid_upload');
    expect(await Attachment.count({ where: { uploadedById: receivingId } })).toBe(before);
  });
});

describe('values the database would refuse are refused by the schemas first', () => {
  it('when a date filter says year 0000 or 9999, then 400 on that field', async () => {
    for (const from of ['0000-01-01', '9999-12-31', '1899-12-31']) {
      const res = await request(t.app).get(`/api/cores?from=${from}`).set('Cookie', intake);
      expect(res.status, from).toBe(400);
      expect(res.body.error.fields, from).toHaveProperty('from');
    }
  });

  it('when a name holds a NUL byte, then 400 on create and on update, and nothing is stored', async () => {
    const email = `${unique('nul')}@test.example`;
    const created = await request(t.app)
      .post('/api/people')
      .set('Cookie', admin)
      .send({ email, name: 'Pat\u0000Example', role: 'operator', password: 'twelve chars ok' });
    expect(created.status).toBe(400);
    expect(created.body.error.fields).toHaveProperty('name');
    expect(await User.count({ where: { email } })).toBe(0);

    const person = await makeUser('operator', { name: 'Before Change' });
    const updated = await request(t.app)
      .patch(`/api/people/${person.id}`)
      .set('Cookie', admin)
      .send({ name: 'After\u0000Change' });
    expect(updated.status).toBe(400);
    expect(updated.body.error.fields).toHaveProperty('name');
    await person.reload();
    expect(person.name).toBe('Before Change');
  });

  it('when a text holds half of a surrogate pair, then 400 (PostgreSQL would store a replacement character)', async () => {
    const person = await makeUser('operator', { name: 'Before Change' });
    const res = await request(t.app)
      .patch(`/api/people/${person.id}`)
      .set('Cookie', admin)
      .set('Content-Type', 'application/json')
      .send('{"name":"Half \\ud83d pair"}');
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('name');
  });

  it('when an id is beyond the integer column, then 400, not a database error', async () => {
    const res = await request(t.app).patch('/api/people/2147483648').set('Cookie', admin).send({ name: 'Nobody Here' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('id');
    const q = await request(t.app).get('/api/cores?family=99999999999').set('Cookie', intake);
    expect(q.status).toBe(400);
    expect(q.body.error.fields).toHaveProperty('family');
  });
});

describe('the build record is named by the stored serial', () => {
  it('when the serial is typed with an en dash or a line break, then the PDF comes with a clean file name', async () => {
    const parts = await finishedParts(t, { receiving, operator }, 'TARN-6');
    const built = await request(t.app)
      .post('/api/units')
      .set('Cookie', operator)
      .send({
        family: 'TARN-6',
        block: parts.block,
        crankshaft: parts.crankshaft,
        heads: parts.heads,
        lots: await lotsFor(0.0197, unique('H')),
      });
    expect(built.status).toBe(201);
    const serial = built.body.serial as string;
    const viewer = await cookieFor(await makeUser('quality'), t.config);
    for (const typed of [serial.replace('-', '–'), serial.replace('-', '\n'), serial.toLowerCase()]) {
      const res = await request(t.app)
        .get(`/api/units/${encodeURIComponent(typed)}/build-record.pdf`)
        .set('Cookie', viewer);
      expect(res.status, JSON.stringify(typed)).toBe(200);
      expect(res.headers['content-type']).toBe('application/pdf');
      // RFC 6266 §4.1: a file name that is a token needs no quotes
      expect(res.headers['content-disposition']).toMatch(
        new RegExp(`^inline; filename="?build-record-${serial}-draft-a4\\.pdf"?$`),
      );
    }
    // a serial no unit has is a JSON 404, without the PDF's headers
    const missing = await request(t.app).get(`/api/units/LB-2222-2222/build-record.pdf`).set('Cookie', viewer);
    expect(missing.status).toBeGreaterThanOrEqual(400);
    expect(missing.status).toBeLessThan(500);
    expect(missing.headers['content-type']).toMatch(/^application\/json/);
    expect(missing.headers['content-disposition']).toBeUndefined();
  });
});

describe('a refused request writes nothing', () => {
  it('when a change is refused, then the audit trail has no event with its request id', async () => {
    const requestId = unique('req-refused-');
    const person = await makeUser('operator');
    await request(t.app)
      .patch(`/api/people/${person.id}`)
      .set('Cookie', admin)
      .set('X-Request-Id', requestId)
      .send({ name: 'x\u0000' });
    expect(await AuditEvent.count({ where: { requestId } })).toBe(0);
  });
});
