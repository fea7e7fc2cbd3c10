import { readFileSync } from 'node:fs';
import { execSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { CONFLICT_REASONS, ERROR_CODES, isErrorCode, statusOf } from '../../shared/errors.js';

// RFC 9110 §15: client errors are 4xx, server errors 5xx.
describe('the error vocabulary', () => {
  it('when a code is declared, then it is snake case with one client or server error status and a meaning', () => {
    for (const [code, { status, meaning }] of Object.entries(ERROR_CODES)) {
      expect(code).toMatch(/^[a-z]+(_[a-z]+)*$/);
      expect(status, code).toBeGreaterThanOrEqual(400);
      expect(status, code).toBeLessThan(600);
      expect(meaning.length, code).toBeGreaterThan(10);
    }
    expect(statusOf('conflict')).toBe(409);
    expect(statusOf('not_found')).toBe(404);
    expect(isErrorCode('conflict')).toBe(true);
    expect(isErrorCode('toString')).toBe(false);
  });

  it('when conflict reasons are listed, then each is listed once', () => {
    expect(new Set(CONFLICT_REASONS).size).toBe(CONFLICT_REASONS.length);
  });

  it('when the server names a code or a conflict reason in its source, then the vocabulary has it', () => {
    const files = execSync("git ls-files 'server/*.ts'", { encoding: 'utf8' }).trim().split('\n');
    const unknown: string[] = [];
    for (const file of files) {
      const text = readFileSync(file, 'utf8');
      // codes handed to AppError, with or without the status before them
      for (const m of text.matchAll(/new AppError\(\s*(?:\d+,\s*)?'([a-z_]+)'/g)) {
        if (!isErrorCode(m[1]!)) unknown.push(`${file}: code ${m[1]}`);
      }
      for (const m of text.matchAll(/\breason: '([a-z_]+)'/g)) {
        if (!(CONFLICT_REASONS as readonly string[]).includes(m[1]!)) unknown.push(`${file}: reason ${m[1]}`);
      }
    }
    expect(unknown).toEqual([]);
  });
});
