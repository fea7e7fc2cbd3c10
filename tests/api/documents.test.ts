import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { inflateSync } from 'node:zlib';
import { PDFParse } from 'pdf-parse';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { pagesMatch, runVerify } from '../../server/cli/verify-document.js';
import { drawDocument } from '../../server/documents/pdf/draw.js';
import { signerFromPem } from '../../server/ledger/signer.js';
import { AuditEvent, Customer, IssuedDocument } from '../../server/models/index.js';
import { plantSettings } from '../../server/services/plant.js';
import type { BuildRecordContent, DocumentContent } from '../../shared/documents/content.js';
import { readingText } from '../../shared/documents/format.js';
import type { CheckableDocument } from '../../shared/ledger/document.js';
import { contentHash } from '../../shared/ledger/entry.js';
import { fromHex } from '../../shared/ledger/merkle.js';
import { attachedDocument } from '../../shared/ledger/pdf-file.js';
import type { TrailJson } from '../../shared/schemas/trail.js';
import { TEST_PASSWORD, cookieFor, makeTestApp, makeUser, type TestApp } from '../support/app.js';
import { OTHER_PLANT_KEY, TEST_PLANT_KEY } from '../support/ledger.js';
import { finishedParts, plantToday, releasableUnit } from '../support/parts.js';

const signer = signerFromPem(TEST_PLANT_KEY);
const stranger = signerFromPem(OTHER_PLANT_KEY);
const keyArg = ['--key', Buffer.from(signer.raw).toString('hex')];
const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'coretrail-pdf-'));
let t: TestApp;
let cookies: { receiving: string; operator: string };
let shipping: string;
let warranty: string;
let unit: string;
let released: request.Response;

const binary = (res: request.Test) =>
  res.buffer(true).parse((r, cb) => {
    const chunks: Buffer[] = [];
    r.on('data', (c: Buffer) => chunks.push(c));
    r.on('end', () => cb(null, Buffer.concat(chunks)));
  });
const pdfOf = async (url: string, cookie = warranty) => {
  const res = await binary(request(t.app).get(url).set('Cookie', cookie));
  if (res.status !== 200) throw new Error(`${url}: ${res.status} ${JSON.stringify(res.body)}`);
  expect(res.headers['content-type']).toBe('application/pdf');
  return { bytes: res.body as Buffer, disposition: String(res.headers['content-disposition']) };
};
const textOf = async (bytes: Buffer) => {
  const parsed = await new PDFParse({ data: new Uint8Array(bytes) }).getText();
  return { text: parsed.text, pages: parsed.pages.map((p) => p.text) };
};
const dataOf = async (bytes: Buffer) =>
  (await attachedDocument(bytes, async (d) => inflateSync(d))) as CheckableDocument & { content: DocumentContent };
const save = (name: string, body: Buffer | string) => {
  const file = path.join(dir, name);
  fs.writeFileSync(file, body);
  if (process.env.DOCS_PDF_DIR) fs.writeFileSync(path.join(process.env.DOCS_PDF_DIR, name), body);
  return file;
};

beforeAll(async () => {
  t = makeTestApp({ AUDIT_SIGNING_KEY: TEST_PLANT_KEY });
  cookies = {
    receiving: await cookieFor(await makeUser('receiving'), t.config),
    operator: await cookieFor(await makeUser('operator'), t.config),
  };
  shipping = await cookieFor(await makeUser('shipping'), t.config);
  warranty = await cookieFor(await makeUser('warranty'), t.config);
  ({ unit } = await releasableUnit(t, cookies, 'TARN-6', 'DOC'));
  const customerId = (await Customer.findOne({ order: [['id', 'ASC']] }))!.id;
  released = await request(t.app).post(`/api/units/${unit}/release`).set('Cookie', shipping).send({
    customerId,
    reference: 'SO-DOC-1',
    shipDate: plantToday(),
    carrier: 'Ridgeway Haulage',
    password: TEST_PASSWORD,
  });
  expect(released.status).toBe(201);
}, 120_000);
afterAll(async () => {
  fs.rmSync(dir, { recursive: true, force: true });
  await t.close();
});

describe('documents issued at release', () => {
  it('when a unit is released, then its build record, certificate and packing slip are issued, each logged with its content hash', async () => {
    const docs = released.body.documents as {
      kind: string;
      documentNumber: string;
      contentHash: string;
      auditEventId: number;
    }[];
    expect(docs.map((d) => d.kind)).toEqual(['build_record', 'certificate', 'packing_slip']);
    for (const d of docs) {
      const row = (await IssuedDocument.findOne({ where: { documentNumber: d.documentNumber } }))!;
      // the stored content hashes to what was logged (RFC 8785 canonical JSON, SHA-256)
      expect(contentHash(row.content)).toBe(d.contentHash);
      const ev = (await AuditEvent.findByPk(d.auditEventId))!;
      expect(ev.action).toBe('document.issued');
      expect((ev.after as { contentHash: string }).contentHash).toBe(d.contentHash);
    }
    // issuing again finds them: no second set, no new event
    const before = await AuditEvent.count({ where: { action: 'document.issued', entityId: unit } });
    const again = await request(t.app).post(`/api/units/${unit}/documents`).set('Cookie', shipping);
    expect(again.status).toBe(200);
    expect(again.body.documents.map((d: { documentNumber: string }) => d.documentNumber)).toEqual(
      docs.map((d) => d.documentNumber),
    );
    expect(await AuditEvent.count({ where: { action: 'document.issued', entityId: unit } })).toBe(before);
  });

  it(
    'when the build record is read back by an independent PDF text extractor, then every reading appears with its unit and verdict',
    { timeout: 120_000 },
    async () => {
      const trail = (await request(t.app).get(`/api/trail/${unit}`).set('Cookie', warranty)).body as TrailJson;
      const { bytes } = await pdfOf(`/api/units/${unit}/build-record.pdf?paper=a4`);
      save('build-record-a4.pdf', bytes);
      const { text, pages } = await textOf(bytes);
      // NFKC: the micro sign (U+00B5) and the Greek mu (U+03BC) share one glyph, so an extractor may give either
      const lines = text.normalize('NFKC').split('\n');
      const current = trail.results.filter((r) => r.supersededBy === null).flatMap((r) => r.readings);
      expect(current.length).toBeGreaterThan(20);
      const missing: string[] = [];
      for (const x of current) {
        const value =
          x.value === null ? (x.passed ? 'pass' : 'fail') : readingText(x.value, x.rule?.resolution ?? null);
        const verdict = x.verdict === 'pass' ? 'pass' : 'FAIL';
        // one table row: characteristic, position, value, unit, limits, verdict, rule version
        const row = lines.find(
          (l) =>
            l.includes(x.positionLabel) &&
            l.includes(value) &&
            (!x.unit || l.includes(` ${x.unit.normalize('NFKC')}`)) &&
            l.includes(verdict) &&
            (x.ruleVersion === null || l.includes(`v${x.ruleVersion}`)),
        );
        if (!row) missing.push(`${x.name} ${x.positionLabel} ${value} ${x.unit ?? ''} ${verdict}`);
      }
      expect(missing).toEqual([]);
      // a header and "Page n of m" on every page
      pages.forEach((p, i) => {
        expect(p).toContain(`Page ${i + 1} of ${pages.length}`);
        expect(p).toContain(`${unit} · BR-${unit}`);
      });
      expect(pages.length).toBeGreaterThan(1);
      // the plant's identity, customer, shipment, lots, genealogy and the release signature
      const plant = await plantSettings();
      for (const s of [
        plant.name,
        plant.address,
        'SO-DOC-1',
        'Ridgeway Haulage',
        'Released for shipment',
        'DOC',
        'Genealogy',
      ]) {
        expect(text).toContain(s);
      }
      // limits in a drawing's signs; nothing written the ASCII way
      expect(text).toMatch(/±|≤|≥/);
      expect(text).not.toMatch(/>=|<=/);
    },
  );

  it(
    'when a document is asked for on A4 and on Letter, then each page has that paper size',
    { timeout: 180_000 },
    async () => {
      for (const [paper, box] of [
        ['a4', '595.28 841.89'], // ISO 216: 210 × 297 mm = 595.28 × 841.89 pt
        ['letter', '612 792'], // ANSI/ASME Y14.1: 8.5 × 11 in = 612 × 792 pt
      ] as const) {
        for (const doc of ['build-record', 'certificate', 'packing-slip']) {
          const { bytes } = await pdfOf(`/api/units/${unit}/${doc}.pdf?paper=${paper}`);
          save(`${doc}-${paper}.pdf`, bytes);
          const boxes = [...bytes.toString('latin1').matchAll(/\/MediaBox \[0 0 ([\d.]+) ([\d.]+)\]/g)].map(
            (m) => `${m[1]} ${m[2]}`,
          );
          expect(boxes.length).toBeGreaterThan(0);
          expect(new Set(boxes)).toEqual(new Set([box]));
        }
      }
    },
  );

  it(
    'when the certificate and packing slip are read back, then each names the release signer and the signature’s meaning',
    { timeout: 120_000 },
    async () => {
      const data = await dataOf((await pdfOf(`/api/units/${unit}/build-record.pdf`)).bytes);
      const release = (data.content as BuildRecordContent).release!;
      expect(release.meaning).toBe('Released for shipment');
      for (const doc of ['certificate', 'packing-slip']) {
        const { bytes, disposition } = await pdfOf(`/api/units/${unit}/${doc}.pdf`, shipping);
        expect(disposition).toMatch(new RegExp(`(COC|PS)-${unit}-\\d+-a4\\.pdf`));
        const { text } = await textOf(bytes);
        expect(text).toContain(release.signer);
        expect(text).toContain('Released for shipment');
        expect(text).toContain('SO-DOC-1');
        expect(text).toContain(unit);
      }
    },
  );

  it(
    'when npm run verify checks the issued PDF, then it is intact and its pages are the ones its data prints',
    { timeout: 120_000 },
    async () => {
      const file = save('issued.pdf', (await pdfOf(`/api/units/${unit}/build-record.pdf?paper=letter`)).bytes);
      const r = await runVerify([file, ...keyArg]);
      expect(r.result.verdict).toBe('intact');
      expect(r.lines).toContain('its pages are the ones its logged data prints');
      expect(r.exit).toBe(0);
    },
  );

  it(
    'when one reading value is changed in a copy of the build record’s data, then verify says altered',
    { timeout: 120_000 },
    async () => {
      const bytes = (await pdfOf(`/api/units/${unit}/build-record.pdf`)).bytes;
      const data = await dataOf(bytes);
      const copy = structuredClone(data);
      const reading = (copy.content as BuildRecordContent).stages
        .flatMap((s) => s.readings)
        .find((x) => /\d/.test(x.value))!;
      reading.value = reading.value.replace(/\d(?=\D*$)/, (d) => String((Number(d) + 1) % 10));
      // the data alone, as a JSON file
      const asJson = await runVerify([save('altered.json', JSON.stringify(copy)), ...keyArg]);
      expect(asJson.result.verdict).toBe('altered');
      expect(asJson.exit).toBe(1);
      // the same change drawn into a whole new PDF with the issued receipt
      const forged = await drawDocument(copy.content, { ...copy, contentHash: contentHash(copy.content) }, 'A4');
      const asPdf = await runVerify([save('altered.pdf', forged), ...keyArg]);
      expect(asPdf.result.verdict).toBe('altered');
      expect(asPdf.lines[0]).toMatch(/^ALTERED: its content differs/);
    },
  );

  it(
    'when a PDF’s pages are not the ones its attached data prints, then verify says altered',
    { timeout: 120_000 },
    async () => {
      const record = await dataOf((await pdfOf(`/api/units/${unit}/build-record.pdf`)).bytes);
      const slip = (await pdfOf(`/api/units/${unit}/packing-slip.pdf`)).bytes;
      expect((await pagesMatch(slip, record))?.verdict).toBe('altered');
    },
  );

  it(
    "when a record is signed with another plant's key, then verify reports it as unknown",
    { timeout: 120_000 },
    async () => {
      const data = await dataOf((await pdfOf(`/api/units/${unit}/certificate.pdf`)).bytes);
      const head = stranger.signHead(data.treeSize, data.head.timestamp, fromHex(data.rootHash));
      const foreign = { ...data, head };
      const pdf = await drawDocument(foreign.content, { ...foreign, contentHash: contentHash(foreign.content) }, 'A4');
      const r = await runVerify([save('foreign.pdf', pdf), ...keyArg]);
      expect(r.result.verdict).toBe('unknown');
      expect(r.exit).toBe(3);
    },
  );

  it(
    'when a unit has not been released, then its build record is a draft that cannot be checked, and it has no certificate',
    { timeout: 180_000 },
    async () => {
      const { unit: waiting } = await releasableUnit(t, cookies, 'TARN-6', 'DRAFT');
      const { bytes } = await pdfOf(`/api/units/${waiting}/build-record.pdf`);
      const { text } = await textOf(bytes);
      expect(text).toContain('DRAFT');
      const r = await runVerify([save('draft.pdf', bytes), ...keyArg]);
      expect(r.result.verdict).toBe('unreadable');
      const coc = await request(t.app).get(`/api/units/${waiting}/certificate.pdf`).set('Cookie', shipping);
      expect(coc.status).toBe(404);
      const issue = await request(t.app).post(`/api/units/${waiting}/documents`).set('Cookie', shipping);
      expect(issue.status).toBe(409);
      expect(issue.body.error.code).toBe('not_released');
    },
  );
});

describe('the traveller', () => {
  it(
    'when a part on its route is printed, then one page shows its serial, family and every stage with its status',
    { timeout: 180_000 },
    async () => {
      const parts = await finishedParts(t, cookies, 'CORRIE-8');
      const item = (await request(t.app).get(`/api/items/${parts.block}`).set('Cookie', cookies.operator)).body as {
        route: { name: string; state: string }[];
        family: { code: string };
      };
      for (const paper of ['a4', 'letter']) {
        const { bytes, disposition } = await pdfOf(
          `/api/items/${parts.block}/traveller.pdf?paper=${paper}`,
          cookies.operator,
        );
        save(`traveller-${paper}.pdf`, bytes);
        expect(disposition).toContain(`traveller-${parts.block}-${paper}.pdf`);
        const { text, pages } = await textOf(bytes);
        expect(pages).toHaveLength(1);
        expect(text).toContain(parts.block);
        expect(text).toContain(item.family.code);
        const words = { done: 'done', current: 'HERE NOW', todo: 'to do', skipped: 'skipped' } as Record<
          string,
          string
        >;
        for (const s of item.route) expect(text).toMatch(new RegExp(`${s.name}.*${words[s.state]}`));
      }
    },
  );
});
