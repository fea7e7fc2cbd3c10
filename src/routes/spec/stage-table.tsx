import { Link } from 'react-router';
import type { SpecBookJson, SpecCharacteristicJson } from '../../../shared/schemas/spec';
import { Badge } from '../../components/ui/badge';
import { Table, TBody, TD, TH, THead, TR } from '../../components/ui/table';
import { formatWhen } from '../../lib/format';
import { specRuleHref } from '../../lib/paths';
import { CriticalMark } from './critical-mark';
import { definitionText, formatNumber, KIND_LABELS, ruleLimitsText, shownState, versionLabel } from './limits';

function LimitsCell({ c }: { c: SpecCharacteristicJson }) {
  if (c.kind === 'attribute') return <span>Pass / fail</span>;
  if (!c.inForce) return <Badge tone="hold">No rule in force</Badge>;
  const how = definitionText(c.inForce);
  return (
    <span className="flex flex-col leading-snug">
      <span className="whitespace-nowrap font-mono font-medium">{ruleLimitsText(c.inForce, c)}</span>
      {how && <span className="whitespace-nowrap font-mono text-xs text-ink-faint">{how}</span>}
    </span>
  );
}

function VersionCell({ c }: { c: SpecCharacteristicJson }) {
  const state = c.inForce ? shownState(c.inForce) : null;
  return (
    <span className="flex flex-col items-start gap-1">
      {c.inForce && state ? (
        <span className="inline-flex items-center gap-1.5">
          <span className="font-mono">{versionLabel(c.inForce.version)}</span>
          <Badge tone={state.tone}>{state.label}</Badge>
        </span>
      ) : (
        <span className="text-ink-soft">{c.kind === 'attribute' ? 'No limits to version' : 'None approved'}</span>
      )}
      {c.scheduled && (
        <span className="text-sm text-wait">
          {versionLabel(c.scheduled.version)} takes effect {formatWhen(c.scheduled.effectiveFrom)}
        </span>
      )}
      {c.draft && (
        <span className="text-sm text-ink-soft">Draft {versionLabel(c.draft.version)} open, not approved</span>
      )}
    </span>
  );
}

function resolutionText(c: SpecCharacteristicJson): string {
  const r = c.inForce?.resolution ?? c.resolution;
  if (c.kind === 'attribute' || r === null) return '—';
  const unit = c.inForce?.unit ?? c.unit;
  return unit ? `${formatNumber(r)} ${unit}` : formatNumber(r);
}

/** One stage of the book: its characteristics with the limits in force now. */
export function StageTable({ family, stage }: { family: string; stage: SpecBookJson['stages'][number] }) {
  return (
    <div className="overflow-x-auto">
      <Table caption={`Characteristics at ${stage.name}`}>
        <colgroup>
          <col className="w-[24%]" />
          <col className="w-[20%]" />
          <col className="w-[11%]" />
          <col className="w-[17%]" />
          <col className="w-[9%]" />
          <col className="w-[13%]" />
          <col className="w-[6%]" />
        </colgroup>
        <THead>
          <tr>
            <TH>Characteristic</TH>
            <TH>Where measured</TH>
            <TH>Kind</TH>
            <TH>Limits in force</TH>
            <TH align="right">Resolution</TH>
            <TH>Version</TH>
            <TH>
              <span className="sr-only">History</span>
            </TH>
          </tr>
        </THead>
        <TBody>
          {stage.characteristics.map((c) => (
            <TR key={c.id}>
              <TD>
                <span className="flex flex-wrap items-center gap-x-2 gap-y-1">
                  <span className="font-medium">{c.name}</span>
                  {c.critical && <CriticalMark />}
                </span>
              </TD>
              <TD>{c.positionsLabel}</TD>
              <TD>{KIND_LABELS[c.kind]}</TD>
              <TD>
                <LimitsCell c={c} />
              </TD>
              <TD align="right" mono nowrap>
                {resolutionText(c)}
              </TD>
              <TD>
                <VersionCell c={c} />
              </TD>
              <TD nowrap>
                <Link
                  to={specRuleHref(family, c.id)}
                  aria-label={`Versions of ${c.name}`}
                  className="inline-flex items-center gap-1 font-medium text-accent underline-offset-4 hover:underline"
                >
                  Versions
                </Link>
              </TD>
            </TR>
          ))}
        </TBody>
      </Table>
    </div>
  );
}
