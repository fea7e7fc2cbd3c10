import { formatWhen } from '../../lib/format';
import type { NcrDetail } from '../../api/ncrs/types';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Icon } from '../../components/ui/icon';
import { Table, TableFrame, TBody, TD, TH, THead, TR } from '../../components/ui/table';

type Reading = NcrDetail['failing'][number];

const withUnit = (v: number, unit: string | null) => (unit ? `${v} ${unit}` : String(v));

function limits(r: Reading): string {
  if (r.lower !== null && r.upper !== null) return `${r.lower} – ${withUnit(r.upper, r.unit)}`;
  if (r.upper !== null) return `≤ ${withUnit(r.upper, r.unit)}`;
  if (r.lower !== null) return `≥ ${withUnit(r.lower, r.unit)}`;
  return r.passed === null ? '—' : 'Pass / fail';
}

function Value({ r }: { r: Reading }) {
  if (r.value !== null) return <span className="font-semibold text-bad">{withUnit(r.value, r.unit)}</span>;
  if (r.passed === false) {
    return (
      <span className="inline-flex items-center gap-1 font-semibold text-bad">
        <Icon name="bad" size={15} />
        Fail
      </span>
    );
  }
  return <span className="text-ink-soft">—</span>;
}

/** The readings that failed, as the station recorded them against the rule version then in force. */
function FailingReadings({ rows }: { rows: Reading[] }) {
  return (
    <TableFrame label="Failing readings">
      <Table caption="Failing readings">
        <THead>
          <tr>
            <TH>Characteristic</TH>
            <TH>Position</TH>
            <TH align="right">Value</TH>
            <TH align="right">Limits</TH>
            <TH>Rule</TH>
            <TH>Location</TH>
          </tr>
        </THead>
        <TBody>
          {rows.map((r) => (
            <TR key={`${r.characteristic}/${r.position}`}>
              <TD>
                <span className="flex flex-col leading-snug">
                  <span className="font-medium">{r.name}</span>
                  <span className="font-mono text-sm text-ink-soft">{r.characteristic}</span>
                </span>
              </TD>
              <TD>{r.positionLabel || r.position || '—'}</TD>
              <TD align="right" mono nowrap>
                <Value r={r} />
              </TD>
              <TD align="right" mono nowrap>
                {limits(r)}
              </TD>
              <TD mono>{r.ruleVersion === null ? '—' : `v${r.ruleVersion}`}</TD>
              <TD>{r.location ?? <span className="text-ink-soft">—</span>}</TD>
            </TR>
          ))}
        </TBody>
      </Table>
    </TableFrame>
  );
}

export function NcrFindings({ ncr }: { ncr: NcrDetail }) {
  return (
    <Card labelledBy="ncr-found-heading">
      <CardHeader
        id="ncr-found-heading"
        title="What was found"
        description={
          ncr.origin
            ? `Raised by a failing ${ncr.origin.stageName} result${ncr.origin.stationName ? ` at ${ncr.origin.stationName}` : ''}, recorded by ${ncr.origin.operator} on ${formatWhen(ncr.origin.finishedAt)}.`
            : `Raised as a concern${ncr.stageName ? ` while the part was at ${ncr.stageName}` : ''}.`
        }
      />
      <CardBody>
        <p className="max-w-prose whitespace-pre-line text-[1.05rem] leading-relaxed">{ncr.description}</p>
      </CardBody>
      {ncr.failing.length > 0 && (
        <div className="border-t border-rule">
          <FailingReadings rows={ncr.failing} />
        </div>
      )}
    </Card>
  );
}

export function NcrPhotos({ ncr }: { ncr: NcrDetail }) {
  return (
    <Card labelledBy="ncr-photos-heading">
      <CardHeader id="ncr-photos-heading" title="Photos" />
      <CardBody>
        {ncr.photos.length === 0 ? (
          <p className="text-ink-soft">No photos were attached.</p>
        ) : (
          <ul className="flex flex-wrap gap-3">
            {ncr.photos.map((p, i) => (
              <li key={p.id}>
                <a href={p.url} target="_blank" rel="noreferrer" className="block rounded-control">
                  <img
                    src={p.url}
                    alt={`Photo ${i + 1}: ${p.fileName}`}
                    className="aspect-[4/3] w-44 rounded-control border border-rule-strong bg-sunk object-cover"
                  />
                </a>
              </li>
            ))}
          </ul>
        )}
      </CardBody>
    </Card>
  );
}
