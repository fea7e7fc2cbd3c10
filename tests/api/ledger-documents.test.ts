import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { verifyCode, verifyDocument } from '../../shared/ledger/document.js';
import { fromHex } from '../../shared/ledger/merkle.js';
import { runVerify } from '../../server/cli/verify-document.js';
import { documentCode, documentFor, recordDocument } from '../../server/ledger/receipts.js';
import { signerFromPem } from '../../server/ledger/signer.js';
import { cookieFor, makeTestApp, makeUser, type TestApp } from '../support/app.js';
import { OTHER_PLANT_KEY, TEST_PLANT_KEY } from '../support/ledger.js';
import { pass, tornDownCore } from '../support/parts.js';

const signer = signerFromPem(TEST_PLANT_KEY);
const stranger = signerFromPem(OTHER_PLANT_KEY);
const opts = { signer, headIntervalMs: 0 };
const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'coretrail-docs-'));
let t: TestApp;
let doc: Awaited<ReturnType<typeof documentFor>>;
let content: { serial: string; results: { readings: { value: number | null }[] }[] };

beforeAll(async () => {
  t = makeTestApp({ AUDIT_SIGNING_KEY: TEST_PLANT_KEY });
  const cookies = {
    receiving: await cookieFor(await makeUser('receiving'), t.config),
    operator: await cookieFor(await makeUser('operator'), t.config),
  };
  // a part's real station results, as the plant records them, are the document's content
  const parts = await tornDownCore(t, cookies, 'CORRIE-8');
  for (const s of ['CLN-1', 'MPI-1', 'PT-1']) await pass(t, cookies.operator, s, parts.block);
  const results = await request(t.app).get(`/api/items/${parts.block}/results`).set('Cookie', cookies.operator);
  expect(results.status).toBe(200);
  content = { serial: parts.block, results: results.body.results ?? results.body };
  const { eventId } = await t.sequelize.transaction((transaction) =>
    recordDocument({ actor: null, requestId: 'doc-test' }, transaction, {
      kind: 'station_results',
      entity: 'item',
      entityId: parts.block,
      content,
    }),
  );
  doc = await documentFor(t.sequelize, eventId, content, opts);
}, 60_000);
afterAll(async () => {
  fs.rmSync(dir, { recursive: true, force: true });
  await t.close();
});

const write = (name: string, body: unknown) => {
  const file = path.join(dir, name);
  fs.writeFileSync(file, JSON.stringify(body, null, 2));
  return file;
};
const plantKeyArg = ['--key', Buffer.from(signer.raw).toString('hex')];

describe('a document checked offline against the signed log', () => {
  it('when the document is as issued, then npm run verify says intact (exit 0)', async () => {
    const file = write('intact.json', doc);
    const r = await runVerify([file, ...plantKeyArg]);
    expect(r.result.verdict).toBe('intact');
    expect(r.exit).toBe(0);
    // the command itself, as a person runs it
    const cli = spawnSync('npx', ['tsx', 'server/cli/verify-document.ts', file, ...plantKeyArg], { encoding: 'utf8' });
    expect(cli.status).toBe(0);
    expect(cli.stdout).toMatch(/^INTACT: entry \d+ of a log of \d+/);
  });

  it('when one reading value in a copy of its data is changed, then verify says altered (exit 1)', async () => {
    const copy = JSON.parse(JSON.stringify(doc)) as typeof doc & { content: typeof content };
    const reading = copy.content.results.flatMap((r) => r.readings).find((x) => typeof x.value === 'number')!;
    reading.value = reading.value! + 0.001;
    const r = await runVerify([write('altered.json', copy), ...plantKeyArg]);
    expect(r.result.verdict).toBe('altered');
    expect(r.exit).toBe(1);
    expect(r.lines[0]).toMatch(/^ALTERED: its content differs/);
  });

  it("when the record's head is signed with another plant's key, then verify says unknown (exit 3)", async () => {
    const foreign = { ...doc, head: stranger.signHead(doc.treeSize, doc.head.timestamp, fromHex(doc.rootHash)) };
    const r = await runVerify([write('foreign.json', foreign), ...plantKeyArg]);
    expect(r.result.verdict).toBe('unknown');
    expect(r.exit).toBe(3);
  });

  it('when the entry itself is swapped for another event, then verify says it is not in the log', () => {
    const other = { ...doc, entry: { ...doc.entry, id: doc.entry.id + 1_000_000 }, code: undefined };
    expect(verifyDocument(other, [signer]).verdict).toBe('not_in_log');
  });

  it('when the /verify page checks the compact code against the latest published head, then it is in the log', async () => {
    const code = await documentCode(t.sequelize, doc.entry.id, opts);
    const pub = await request(t.app).get('/api/audit/log/head');
    expect(pub.status).toBe(200);
    const cons = await request(t.app).get(
      `/api/audit/log/consistency?from=${doc.treeSize}&to=${pub.body.head.treeSize}`,
    );
    expect(cons.status).toBe(200);
    expect(verifyCode(code, pub.body.head, [pub.body.key], cons.body.proof).verdict).toBe('intact');
    expect(verifyCode(doc.code!, pub.body.head, [pub.body.key], cons.body.proof).verdict).toBe('intact');
  });
});
