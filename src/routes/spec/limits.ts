import type { CharacteristicKind } from '../../../shared/domain/evaluate';
import { limitsOf } from '../../../shared/domain/tolerance';
import {
  RULE_STATUS_LABELS,
  type RuleJson,
  type RuleLimits,
  type SpecCharacteristicJson,
} from '../../../shared/schemas/spec';
import type { Tone } from '../../components/ui/badge';
import { formatWhen } from '../../lib/format';

/** A value as the engineer typed it (no padding, no exponent), with a true minus sign. */
export function formatNumber(v: number | null | undefined): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '—';
  const s = v.toLocaleString('en-US', { maximumFractionDigits: 10, useGrouping: false });
  return s.replace('-', '−');
}

/** How many decimals a value shows as typed: 4.0305 → 4, 40 → 0. */
export function decimalsOf(v: number | null | undefined): number {
  const s = formatNumber(v);
  const dot = s.indexOf('.');
  return dot < 0 ? 0 : s.length - dot - 1;
}

/** A value to exactly `decimals` places, with a true minus sign. */
export function formatFixed(v: number, decimals: number): string {
  const d = Math.min(10, Math.max(0, decimals));
  return v
    .toLocaleString('en-US', { minimumFractionDigits: d, maximumFractionDigits: d, useGrouping: false })
    .replace('-', '−');
}

/** Values shown side by side with the same decimals, so 3.72 beside 3.721 reads 3.720. */
function alike(values: (number | null)[]): string[] {
  const d = Math.max(0, ...values.map(decimalsOf));
  return values.map((v) => (v === null ? '—' : formatFixed(v, d)));
}

const withUnit = (s: string, unit: string | null | undefined) => (unit ? `${s} ${unit}` : s);

type Limits = { lower: number | null; upper: number | null };

/** "4.0295 – 4.0305 in", "≥ 40 psi", "≤ 0.001 in". */
export function limitsText({ lower, upper }: Limits, unit: string | null | undefined): string {
  if (lower !== null && upper !== null) {
    const [lo, hi] = alike([lower, upper]);
    return withUnit(`${lo} – ${hi}`, unit);
  }
  if (lower !== null) return withUnit(`≥ ${formatNumber(lower)}`, unit);
  if (upper !== null) return withUnit(`≤ ${formatNumber(upper)}`, unit);
  return '—';
}

/** The limits a rule sets, in words and numbers; a pass/fail check has none. */
export function ruleLimitsText(rule: RuleJson | null, c: Pick<SpecCharacteristicJson, 'kind' | 'unit'>): string {
  if (c.kind === 'attribute' || rule?.limitType === 'attribute') return 'Pass / fail';
  if (!rule) return 'No rule in force';
  return limitsText(rule, rule.unit ?? c.unit);
}

/** How the limits were set, when that is more than the limits themselves: "nominal 4.03 ± 0.0005". */
export function definitionText(rule: Pick<RuleJson, 'limitType' | 'nominal' | 'minusTol' | 'plusTol'>): string | null {
  if (rule.limitType !== 'nominal' || rule.nominal === null) return null;
  const [n, minus, plus] = alike([rule.nominal, rule.minusTol, rule.plusTol]);
  if (rule.minusTol === rule.plusTol) return `nominal ${n} ± ${plus}`;
  return `nominal ${n} −${minus} / +${plus}`;
}

/** The limits a draft's fields would set, or null while they are not yet a valid rule. */
export function previewLimits(l: RuleLimits): Limits | null {
  try {
    return limitsOf(l);
  } catch {
    return null;
  }
}

export const KIND_LABELS: Record<CharacteristicKind, string> = {
  variable: 'Measured',
  derived: 'Calculated',
  attribute: 'Pass / fail check',
};

export const KIND_HINTS: Record<CharacteristicKind, string> = {
  variable: 'Read from a gauge at each position.',
  derived: 'Worked out from other readings of the same result; nobody types it.',
  attribute: 'The operator records pass or fail; there are no limits to set.',
};

/** "v1" */
export const versionLabel = (version: number) => `v${version}`;

export type ShownState = { label: string; tone: Tone };

/**
 * What a version is now. The stored status says what happened to it; the times say whether that
 * has taken effect yet: a version approved for later is not in force, and the one it will
 * replace is still in force until then although already marked superseded.
 */
export function shownState(rule: RuleJson, now = Date.now()): ShownState {
  const from = rule.effectiveFrom ? Date.parse(rule.effectiveFrom) : null;
  const until = rule.supersededAt ? Date.parse(rule.supersededAt) : null;
  switch (rule.status) {
    case 'draft':
      return { label: RULE_STATUS_LABELS.draft, tone: 'wait' };
    case 'withdrawn':
      return { label: RULE_STATUS_LABELS.withdrawn, tone: 'off' };
    case 'approved':
    case 'superseded':
      if (from !== null && from > now) return { label: `Takes effect ${formatWhen(rule.effectiveFrom)}`, tone: 'wait' };
      if (until !== null && until <= now) return { label: RULE_STATUS_LABELS.superseded, tone: 'neutral' };
      return { label: RULE_STATUS_LABELS.approved, tone: 'ok' };
  }
}

/** A version's size classes in one line: "STD 3.7003–3.7013 · +0.25 3.7101–3.7111 in"; '—' when none. */
export function sizeClassesText(rule: Pick<RuleJson, 'sizeClasses' | 'unit'>): string {
  if (!rule.sizeClasses?.length) return '—';
  const unit = rule.unit ? ` ${rule.unit}` : '';
  return `${rule.sizeClasses.map((k) => `${k.code} ${k.lower}–${k.upper}`).join(' · ')}${unit}`;
}

/** The limits of a stored version as a draft's fields (what "Start a draft" copies). */
export function limitsFrom(rule: RuleJson | null, c: Pick<SpecCharacteristicJson, 'resolution'>): RuleLimits {
  const limitType = rule && rule.limitType !== 'attribute' ? rule.limitType : 'nominal';
  return {
    limitType,
    nominal: rule?.nominal ?? null,
    minusTol: rule?.minusTol ?? null,
    plusTol: rule?.plusTol ?? null,
    lowerLimit: rule?.lowerLimit ?? null,
    upperLimit: rule?.upperLimit ?? null,
    resolution: rule?.resolution ?? c.resolution ?? 0,
    sourceNote: rule?.sourceNote ?? '',
    sizeClasses: (rule?.sizeClasses ?? []).map(({ code, name, nominal, minusTol, plusTol }) => ({
      code,
      name,
      nominal,
      minusTol,
      plusTol,
    })),
  };
}
