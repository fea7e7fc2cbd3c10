import { LIMIT_TYPE_LABELS, type RuleHistoryJson, type RuleJson } from '../../../shared/schemas/spec';
import { Badge } from '../../components/ui/badge';
import { formatWhen } from '../../lib/format';
import { decimalsOf, formatFixed, ruleLimitsText, shownState, sizeClassesText } from './limits';

/**
 * `spec`: what the rule says (compared, a difference marked); `record`: the facts of each version's
 * own life (status, dates, people), which are naturally different and so never marked.
 */
type Line = { label: string; value: (r: RuleJson) => string; mono?: boolean; record?: boolean };

function lines(history: RuleHistoryJson): Line[] {
  const c = history.characteristic;
  // each number to at least the resolution's decimals, as a drawing would write it: 4.0300, not 4.03
  const withUnit = (v: number | null, r: RuleJson) => {
    if (v === null) return '—';
    const d = Math.max(decimalsOf(v), decimalsOf(r.resolution));
    const unit = r.unit ?? c.unit;
    return `${formatFixed(v, d)}${unit ? ` ${unit}` : ''}`;
  };
  const person = (name: string | null, at: string | null) => (name ? `${name}, ${formatWhen(at)}` : '—');
  return [
    { label: 'Limits', value: (r) => ruleLimitsText(r, c), mono: true },
    { label: 'Limit type', value: (r) => LIMIT_TYPE_LABELS[r.limitType] },
    { label: 'Nominal', value: (r) => withUnit(r.nominal, r), mono: true },
    { label: 'Minus tolerance', value: (r) => withUnit(r.minusTol, r), mono: true },
    { label: 'Plus tolerance', value: (r) => withUnit(r.plusTol, r), mono: true },
    { label: 'Lower limit', value: (r) => withUnit(r.lowerLimit, r), mono: true },
    { label: 'Upper limit', value: (r) => withUnit(r.upperLimit, r), mono: true },
    { label: 'Resolution', value: (r) => withUnit(r.resolution, r), mono: true },
    { label: 'Size classes', value: (r) => sizeClassesText(r), mono: true },
    { label: 'Source note', value: (r) => r.sourceNote || '—' },
    { label: 'Status', value: (r) => shownState(r).label, record: true },
    { label: 'Effective from', value: (r) => formatWhen(r.effectiveFrom), mono: true, record: true },
    { label: 'Superseded at', value: (r) => formatWhen(r.supersededAt), mono: true, record: true },
    { label: 'Drafted by', value: (r) => person(r.createdBy, r.createdAt), record: true },
    { label: 'Approved by', value: (r) => person(r.approvedBy, r.approvedAt), record: true },
    { label: 'Reason', value: (r) => r.approvalReason ?? '—', record: true },
    {
      label: 'Signature',
      value: (r) =>
        r.signature ? `${r.signature.printedName}, ${formatWhen(r.signature.signedAt)}: ${r.signature.meaning}` : '—',
      record: true,
    },
  ];
}

/** A field that differs between the two: tinted, edged, and said in words. */
function Differs() {
  return (
    <span className="ml-1.5 inline-flex items-center rounded-control border border-accent px-1 text-xs font-semibold uppercase tracking-wide text-accent-strong">
      <span aria-hidden="true">≠&nbsp;</span>differs
    </span>
  );
}

type CompareProps = { history: RuleHistoryJson; older: RuleJson; newer: RuleJson };

/**
 * Two versions in two columns, field by field. The columns share one grid (subgrid rows), so a
 * long source note in one keeps the fields beside it level; each column is its own section with
 * its own heading, so a screen reader hears one whole version, then the other.
 */
export function CompareVersions({ history, older, newer }: CompareProps) {
  const all = lines(history);
  const differs = all.map((l) => !l.record && l.value(older) !== l.value(newer));
  const changed = all.filter((_, i) => differs[i]).map((l) => l.label);
  const span = { gridRow: `span ${all.length + 1} / span ${all.length + 1}` };
  const cell = (i: number) =>
    `border-b border-rule px-3 py-1.5 ${differs[i] ? 'border-l-4 border-l-accent bg-accent-tint' : 'border-l-4 border-l-transparent'}`;

  return (
    <section aria-labelledby="compare-heading">
      <h3 id="compare-heading" className="text-base font-semibold">
        Version {older.version} and version {newer.version} side by side
      </h3>
      <p className="mb-3 text-sm text-ink-soft">
        {changed.length
          ? `What the rule says differs in ${changed.length === 1 ? '1 field' : `${changed.length} fields`}: ${changed.join(', ')}. The rows below them are each version's own record.`
          : 'What the rule says is the same in both; only each version’s own record differs.'}
      </p>
      <div className="grid grid-cols-[minmax(8rem,12rem)_minmax(0,1fr)_minmax(0,1fr)] rounded-control border border-rule bg-card text-[0.925rem]">
        <div aria-hidden="true" className="grid grid-rows-subgrid bg-sunk" style={span}>
          <div className="border-b border-rule-strong px-3 py-2" />
          {all.map((l, i) => (
            <div key={l.label} className="border-b border-rule px-3 py-1.5 font-medium text-ink-soft">
              {l.label}
              {differs[i] && <span className="ml-1 font-bold text-accent-strong">≠</span>}
            </div>
          ))}
        </div>
        {[older, newer].map((r) => (
          <section
            key={r.id}
            aria-labelledby={`compare-v${r.version}`}
            className="grid grid-rows-subgrid border-l border-rule"
            style={span}
          >
            <div className="flex flex-wrap items-center gap-2 border-b border-rule-strong bg-sunk px-3 py-2">
              <h4 id={`compare-v${r.version}`} className="font-semibold">
                Version {r.version}
              </h4>
              <Badge tone={shownState(r).tone}>{shownState(r).label}</Badge>
            </div>
            <dl className="contents">
              {all.map((l, i) => (
                <div key={l.label} className={cell(i)}>
                  <dt className="sr-only">{l.label}</dt>
                  <dd className={l.mono ? 'font-mono text-[0.875rem]' : ''}>
                    {l.value(r)}
                    {differs[i] && <Differs />}
                  </dd>
                </div>
              ))}
            </dl>
          </section>
        ))}
      </div>
    </section>
  );
}
