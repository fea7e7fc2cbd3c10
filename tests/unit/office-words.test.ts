import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { can, type Permission } from '../../shared/permissions.js';
import { ROLES, ROLE_SUMMARIES } from '../../shared/roles.js';
import { NCR_STATES } from '../../shared/schemas/ncr.js';
import { ACTION_LABELS, ENTITY_LABELS, recordName } from '../../src/routes/admin/audit/words.js';

/** Every .ts file under server/, read as text. */
function serverSources(dir = 'server'): string[] {
  return fs.readdirSync(dir, { withFileTypes: true }).flatMap((d) => {
    const p = path.join(dir, d.name);
    if (d.isDirectory()) return serverSources(p);
    return p.endsWith('.ts') ? [fs.readFileSync(p, 'utf8')] : [];
  });
}

describe('the audit trail speaks in words', () => {
  const sources = serverSources().join('\n');

  it('when the server records an event, then its kind of record and its action have words on the audit page', () => {
    // every literal passed to recordAudit: `entity: '…'` and `action: '…'` (the sources are the reference)
    const entities = new Set([...sources.matchAll(/entity: (?:user \? 'user' : )?'([a-z_]+)'/g)].map((m) => m[1]!));
    const actionLines = sources.split('\n').filter((l) => /\baction: /.test(l));
    const actions = new Set(actionLines.flatMap((l) => [...l.matchAll(/'([a-z_]+\.[a-z_]+)'/g)].map((m) => m[1]!)));
    // the ones built at run time: an NCR's new state, a lot's new status (server/services/ncrs/steps.ts)
    for (const state of NCR_STATES.filter((s) => s !== 'raised')) actions.add(`ncr.${state}`);
    for (const status of ['returned', 'scrapped']) actions.add(`lot.${status}`);
    entities.delete('pending'); // an upload's placeholder owner, never an audited record
    entities.add('sign_in'); // server/services/lockouts.ts: `user ? 'user' : 'sign_in'`
    expect(entities.size).toBeGreaterThan(10);
    expect(actions.size).toBeGreaterThan(40);
    expect([...entities].filter((e) => !ENTITY_LABELS[e])).toEqual([]);
    expect([...actions].filter((a) => !ACTION_LABELS[a])).toEqual([]);
  });

  it('when a record is named, then its kind is in words before its id', () => {
    // serial prefixes from shared/domain/serial.ts
    expect(recordName('item', 'CR-7KX4-P2MK')).toBe('Core CR-7KX4-P2MK');
    expect(recordName('item', 'LB-7KX4-P2MK')).toBe('Long block LB-7KX4-P2MK');
    expect(recordName('stage_result', '1664')).toBe('Stage result 1664');
    expect(recordName('nonconformance', 'NC-2026-00001')).toBe('NCR NC-2026-00001');
  });
});

describe('home pages say only what the product does', () => {
  // words of work no screen does yet, and words tied to the screen that does them (common practice:
  // a summary names a screen its role can open)
  const never = [/yield/i, /throughput/i, /claim/i, /work in process/i, /\bscrap rate/i];
  const needs: [RegExp, Permission][] = [
    [/control chart|capabilit/i, 'spc.read'],
    [/spec book/i, 'spec.read'],
    [/audit trail/i, 'audit.read'],
    [/field action/i, 'field-actions.read'],
    [/nonconformance|NCR/, 'ncr.read'],
    [/shipment|release/i, 'release.check'],
  ];
  for (const role of ROLES) {
    it(`when ${role} reads their home page, then its summary promises nothing without a screen`, () => {
      const summary = ROLE_SUMMARIES[role];
      expect(never.filter((w) => w.test(summary)).map(String)).toEqual([]);
      expect(needs.filter(([w, p]) => w.test(summary) && !can(role, p)).map(([w]) => String(w))).toEqual([]);
    });
  }
});
