import { describe, expect, it } from 'vitest';
import { can, PERMISSION_NAMES, PERMISSIONS, permissionsOf } from '../../shared/permissions.js';
import { ROLES } from '../../shared/roles.js';
import { passwordSchema } from '../../shared/schemas/auth.js';

describe('permission matrix', () => {
  it('names only known roles, and every permission has a holder', () => {
    for (const p of PERMISSION_NAMES) {
      expect(PERMISSIONS[p].length, p).toBeGreaterThan(0);
      for (const r of PERMISSIONS[p]) expect(ROLES).toContain(r);
    }
  });
  it('gives each role only its own areas', () => {
    expect(can('admin', 'people.manage')).toBe(true);
    expect(can('operator', 'people.manage')).toBe(false);
    expect(can('quality', 'spec.approve')).toBe(true);
    expect(can('operator', 'spec.approve')).toBe(false);
    expect(can('shipping', 'release.ship')).toBe(true);
    expect(can('warranty', 'release.ship')).toBe(false);
    expect(can(null, 'reference.read')).toBe(false);
  });
  it('use as is and the other dispositions are for quality only (ISO 9001:2015 8.7: the authority deciding is recorded)', () => {
    expect(ROLES.filter((r) => can(r, 'ncr.disposition'))).toEqual(['quality']);
  });
  it('everyone signed in may read reference data and manage their own account', () => {
    for (const r of ROLES) {
      expect(permissionsOf(r)).toContain('reference.read');
      expect(permissionsOf(r)).toContain('account.self');
    }
  });
});

describe('password rule', () => {
  it('refuses under 12 characters', () => {
    expect(passwordSchema.safeParse('a'.repeat(11)).success).toBe(false);
    expect(passwordSchema.safeParse('a'.repeat(12)).success).toBe(true);
  });
  it('refuses over 72 bytes, counting UTF-8 bytes, not characters (bcrypt reads 72 bytes)', () => {
    expect(passwordSchema.safeParse('a'.repeat(72)).success).toBe(true);
    expect(passwordSchema.safeParse('a'.repeat(73)).success).toBe(false);
    expect(passwordSchema.safeParse('é'.repeat(36)).success).toBe(true); // 72 bytes
    expect(passwordSchema.safeParse('é'.repeat(37)).success).toBe(false); // 74 bytes, 37 characters
  });
});
