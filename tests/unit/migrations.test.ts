import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { MIGRATIONS } from '../../db/migrations/index.js';

describe('migrations list', () => {
  it('names every timestamped file in db/migrations, oldest first', () => {
    const files = fs
      .readdirSync(path.resolve('db/migrations'))
      .filter((f) => /^\d{14}-.+\.ts$/.test(f))
      .map((f) => f.replace(/\.ts$/, ''))
      .sort();
    expect(MIGRATIONS.map((m) => m.name)).toEqual(files);
  });
});
