import { useState } from 'react';
import { useLocation, useNavigate, useSearchParams } from 'react-router';
import type { RuleHistoryJson, RuleJson } from '../../../shared/schemas/spec';
import { Badge } from '../../components/ui/badge';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Checkbox } from '../../components/ui/input';
import { EmptyRow, Table, TBody, TD, TH, THead, TR } from '../../components/ui/table';
import { formatWhen, plural } from '../../lib/format';
import { CompareVersions } from './compare-versions';
import { definitionText, formatNumber, ruleLimitsText, shownState, versionLabel } from './limits';

/**
 * The pair shown side by side, from `?compare=1,2`. Without the
 * parameter, the two newest versions that were not discarded; `?compare=` on its own means none.
 */
export function comparedVersions(raw: string | null, versions: RuleJson[]): number[] {
  const exists = new Set(versions.map((v) => v.version));
  if (raw === null) {
    if (versions.length < 2) return [];
    const kept = versions.filter((v) => v.status !== 'withdrawn');
    return (kept.length >= 2 ? kept : versions).slice(0, 2).map((v) => v.version);
  }
  const picked = raw
    .split(',')
    .map((s) => Number(s.trim()))
    .filter((n) => Number.isInteger(n) && exists.has(n));
  return [...new Set(picked)].slice(-2);
}

/** Ticking a third drops the one ticked longest ago, so two stay chosen. */
function toggled(chosen: number[], version: number): number[] {
  if (chosen.includes(version)) return chosen.filter((v) => v !== version);
  return [...chosen, version].slice(-2);
}

function useCompare(versions: RuleJson[]) {
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const { pathname } = useLocation();
  const raw = params.get('compare');
  // the tick shows at once; the address follows when the router has caught up (its loader runs first)
  const [local, setLocal] = useState<number[] | null>(null);
  const [seen, setSeen] = useState(raw);
  if (raw !== seen) {
    setSeen(raw);
    setLocal(null);
  }
  const chosen = local ?? comparedVersions(raw, versions);
  const toggle = (version: number) => {
    const pair = toggled(chosen, version);
    setLocal(pair);
    const next = new URLSearchParams(params);
    next.set('compare', [...pair].sort((a, b) => a - b).join(','));
    // commas stay readable in the address: ?compare=1,2
    void navigate(`${pathname}?${next.toString().replace(/%2C/gi, ',')}`, { replace: true, preventScrollReset: true });
  };
  return { chosen, toggle };
}

function approvalCell(v: RuleJson) {
  if (!v.approvedBy) return <span className="text-ink-soft">—</span>;
  return (
    <span className="flex flex-col leading-snug">
      <span>{v.approvedBy}</span>
      {v.approvedAt && <span className="font-mono text-xs text-ink-faint">{formatWhen(v.approvedAt)}</span>}
    </span>
  );
}

export function VersionHistory({ history }: { history: RuleHistoryJson }) {
  const versions = history.versions;
  const { chosen, toggle } = useCompare(versions);
  const c = history.characteristic;
  const pair = versions.filter((v) => chosen.includes(v.version)).sort((a, b) => a.version - b.version) as RuleJson[];

  return (
    <Card labelledBy="history-heading">
      <CardHeader
        id="history-heading"
        title="Version history"
        description={
          versions.length >= 2
            ? `${plural(versions.length, 'version')}, newest first. Tick two to compare them side by side.`
            : versions.length === 1
              ? 'One version so far.'
              : 'No versions yet.'
        }
      />
      <div className="overflow-x-auto">
        <Table caption={`Versions of ${c.name} for ${history.family.code}`}>
          <THead>
            <tr>
              <TH>Compare</TH>
              <TH>Version</TH>
              <TH>Status</TH>
              <TH>Limits</TH>
              <TH align="right">Resolution</TH>
              <TH>Effective from</TH>
              <TH wideOnly>Superseded at</TH>
              <TH wideOnly>Drafted by</TH>
              <TH>Approved by</TH>
            </tr>
          </THead>
          <TBody>
            {versions.length === 0 && (
              <EmptyRow colSpan={9}>
                {c.kind === 'attribute' ? 'A pass/fail check has no versions of limits.' : 'No version drafted yet.'}
              </EmptyRow>
            )}
            {versions.map((v) => {
              const state = shownState(v);
              const how = definitionText(v);
              return (
                <TR key={v.id} muted={v.status === 'withdrawn'}>
                  <TD>
                    {/* the label is the finger's target on a touch screen, the box alone is too small */}
                    <label className="-m-2 inline-flex items-center justify-center p-2 floor:size-12">
                      <Checkbox
                        aria-label={`Compare version ${v.version}`}
                        checked={chosen.includes(v.version)}
                        onChange={() => toggle(v.version)}
                      />
                    </label>
                  </TD>
                  <TD mono nowrap>
                    {versionLabel(v.version)}
                  </TD>
                  <TD nowrap>
                    <Badge tone={state.tone}>{state.label}</Badge>
                  </TD>
                  <TD>
                    <span className="flex flex-col leading-snug">
                      <span className="font-mono">{ruleLimitsText(v, c)}</span>
                      {how && <span className="whitespace-nowrap font-mono text-xs text-ink-faint">{how}</span>}
                    </span>
                  </TD>
                  <TD align="right" mono nowrap>
                    {formatNumber(v.resolution)}
                  </TD>
                  <TD mono nowrap>
                    {formatWhen(v.effectiveFrom)}
                  </TD>
                  <TD mono nowrap wideOnly>
                    {formatWhen(v.supersededAt)}
                  </TD>
                  <TD wideOnly>{v.createdBy}</TD>
                  <TD>{approvalCell(v)}</TD>
                </TR>
              );
            })}
          </TBody>
        </Table>
      </div>
      {versions.length > 0 && (
        <CardBody>
          {pair.length === 2 ? (
            <CompareVersions history={history} older={pair[0]!} newer={pair[1]!} />
          ) : versions.length < 2 ? (
            <p className="text-ink-soft">Only one version so far: nothing to compare it with.</p>
          ) : (
            <p className="text-ink-soft">
              {pair.length === 1
                ? `Version ${pair[0]!.version} is ticked. Tick one more to compare.`
                : 'Tick two versions to compare them side by side.'}
            </p>
          )}
        </CardBody>
      )}
    </Card>
  );
}
