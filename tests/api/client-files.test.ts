import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeTestApp, type TestApp } from '../support/app.js';

// A built client in a folder whose path has a dot-folder in it (as the benchmark's .bench/dist
// has), named relative to the working directory as an operator might write it in the environment.
let root: string;
let t: TestApp;
beforeAll(() => {
  root = fs.mkdtempSync(path.join(os.tmpdir(), 'coretrail-client-'));
  const dist = path.join(root, '.build', 'dist');
  fs.mkdirSync(path.join(dist, 'assets'), { recursive: true });
  fs.writeFileSync(path.join(dist, 'index.html'), '<!doctype html><title>Coretrail</title><div id="root"></div>');
  fs.writeFileSync(path.join(dist, 'assets', 'app.js'), `console.log(${JSON.stringify('x'.repeat(4000))});\n`);
  t = makeTestApp({ CLIENT_DIR: path.relative(process.cwd(), dist) });
});
afterAll(async () => {
  await t.close();
  fs.rmSync(root, { recursive: true, force: true });
});

describe('the built client', () => {
  it('answers any page address with index.html, never cached', async () => {
    const res = await request(t.app).get('/station?serial=BK-CDEH-6VCP');
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/^text\/html/);
    expect(res.text).toContain('<div id="root">');
    expect(res.headers['cache-control']).toBe('no-store');
  });

  it('sends its files compressed when the browser accepts it', async () => {
    const res = await request(t.app).get('/assets/app.js').set('Accept-Encoding', 'gzip');
    expect(res.status).toBe(200);
    expect(res.headers['content-encoding']).toBe('gzip');
    expect(res.text).toContain('xxxx'); // supertest undoes the gzip
  });

  it('leaves an unknown API path to the API: JSON 404, not the page', async () => {
    const res = await request(t.app).get('/api/no-such-thing');
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe('not_found');
  });
});
