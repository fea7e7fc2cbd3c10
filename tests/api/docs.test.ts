import fs from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeTestApp, type TestApp } from '../support/app.js';

let t: TestApp;
beforeAll(() => {
  t = makeTestApp();
});
afterAll(() => t.close());

// docs/api.md is a table with one row per route: | METHOD | /api/path | access (roles) | summary |
function documentedRoutes() {
  const rows = fs
    .readFileSync('docs/api.md', 'utf8')
    .split('\n')
    .map((line) => line.match(/^\|\s*(GET|POST|PUT|PATCH|DELETE)\s*\|\s*`?([^|`\s]+)`?\s*\|\s*`?([a-z.-]+)`?/))
    .filter((m): m is RegExpMatchArray => m !== null);
  return rows.map((m) => ({ method: m[1]!.toLowerCase(), path: m[2]!, access: m[3]! }));
}

describe('docs/api.md matches the code', () => {
  it('lists every route with its access, and no route that does not exist', () => {
    const documented = documentedRoutes()
      .map((r) => `${r.method} ${r.path} ${r.access}`)
      .sort();
    const actual = t.app.apiRoutes.map((r) => `${r.method} ${r.path} ${r.access}`).sort();
    expect(documented).toEqual(actual);
  });
});
