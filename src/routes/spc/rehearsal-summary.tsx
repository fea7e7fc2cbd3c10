import { Link } from 'react-router';
import type { RehearsalJson } from '../../../shared/schemas/spc';
import { Badge } from '../../components/ui/badge';
import { EmptyRow, Table, TableFrame, TBody, TD, TH, THead, TR } from '../../components/ui/table';
import { formatWhen, plural } from '../../lib/format';
import { itemHref, trailHref } from '../../lib/paths';
import { CsvButton } from './numbers-panel';
import { index2 } from './numbers';

const limitsText = (l: { lower: number | null; upper: number | null }) =>
  l.lower !== null && l.upper !== null
    ? `${l.lower} to ${l.upper}`
    : l.lower !== null
      ? `at least ${l.lower}`
      : `at most ${l.upper}`;

/** The counts and Cpk of a rehearsal, in words first: what approving the draft would change. */
export function RehearsalCounts({ rehearsal }: { rehearsal: RehearsalJson }) {
  const s = rehearsal.summary;
  const c = s.counts;
  const where = [s.station && `at ${s.station}`, s.gauge && `with ${s.gauge}`].filter(Boolean).join(' ');
  return (
    <div className="flex flex-col gap-2">
      <p className="text-sm text-ink-soft">
        {plural(c.parts, 'part')} recorded {s.period.from.slice(0, 10)} to{' '}
        {new Date(Date.parse(s.period.to) - 1).toISOString().slice(0, 10)}
        {where ? ` ${where}` : ''}, each as it left the stage, judged again against version {s.draft.version} (
        <span className="font-mono">{limitsText(s.draft)}</span>)
        {s.current ? (
          <>
            {' '}
            instead of version {s.current.version} (<span className="font-mono">{limitsText(s.current)}</span>)
          </>
        ) : null}
        . Rehearsed by {rehearsal.runBy}, <span className="font-mono">{formatWhen(rehearsal.runAt)}</span>.
      </p>
      <ul className="flex flex-wrap gap-2" aria-label="What would change">
        <li>
          <Badge tone={c.partsPassToFail ? 'bad' : 'ok'}>{plural(c.partsPassToFail, 'part')} would now fail</Badge>
        </li>
        <li>
          <Badge tone={c.partsFailToPass ? 'wait' : 'neutral'} icon={c.partsFailToPass ? 'wait' : null}>
            {plural(c.partsFailToPass, 'part')} would now pass
          </Badge>
        </li>
        <li>
          <Badge tone={c.shippedUnits ? 'hold' : 'ok'}>{plural(c.shippedUnits, 'shipped unit')} out of tolerance</Badge>
        </li>
        <li>
          <Badge tone="neutral">
            Cpk {index2(s.before?.cpk)} → {index2(s.after?.cpk)}
            {s.after?.cpkLower !== null && s.after?.cpkLower !== undefined
              ? ` (95 %: ${index2(s.after.cpkLower)} to ${index2(s.after.cpkUpper)})`
              : ''}
          </Badge>
        </li>
      </ul>
      <p className="text-sm text-ink-soft">
        Parts failing: {c.partsFailingBefore} now, {c.partsFailingAfter} under the draft. Readings:{' '}
        {c.readingsPassToFail} pass → fail, {c.readingsFailToPass} fail → pass. σ within
        {s.sigmaSource === 'frozen limits' ? ' from the frozen control limits' : ' from these readings'}.
      </p>
    </div>
  );
}

/** The parts that would flip and the shipped units they are in, as tables with CSV. */
export function RehearsalDetail({ rehearsal, canTrail }: { rehearsal: RehearsalJson; canTrail: boolean }) {
  const s = rehearsal.summary;
  const stem = `rehearsal-${rehearsal.id}`;
  return (
    <div className="flex flex-col gap-4">
      <section aria-label="Parts that would flip" className="flex flex-col gap-2">
        <h4 className="font-semibold">Parts that would flip ({s.parts.length})</h4>
        <div className="rounded-control border border-rule">
          <TableFrame label="Parts that would flip">
            <Table caption="Parts that would flip">
              <THead>
                <tr>
                  <TH>Serial</TH>
                  <TH>Recorded</TH>
                  <TH>Verdict</TH>
                  <TH align="right">Readings now failing</TH>
                </tr>
              </THead>
              <TBody>
                {s.parts.length === 0 && <EmptyRow colSpan={4}>No part would change its verdict.</EmptyRow>}
                {s.parts.map((p) => (
                  <TR key={p.itemId}>
                    <TD mono>
                      <Link className="text-accent underline underline-offset-2" to={itemHref(p.serial)}>
                        {p.serial}
                      </Link>
                    </TD>
                    <TD mono nowrap>
                      {formatWhen(p.at)}
                    </TD>
                    <TD>
                      {p.flip === 'pass-to-fail' ? (
                        <Badge tone="bad">Passed → would fail</Badge>
                      ) : (
                        <Badge tone="ok">Failed → would pass</Badge>
                      )}
                    </TD>
                    <TD align="right" mono>
                      {p.failingPositions.length}
                    </TD>
                  </TR>
                ))}
              </TBody>
            </Table>
          </TableFrame>
        </div>
        <div data-density="floor">
          <CsvButton
            filename={`${stem}-parts.csv`}
            rows={s.parts}
            columns={[
              { header: 'Serial', text: (p) => p.serial },
              { header: 'Recorded', text: (p) => p.at },
              { header: 'Flip', text: (p) => p.flip },
              { header: 'Failing positions', text: (p) => p.failingPositions.join(' ') },
            ]}
          />
        </div>
      </section>
      <section aria-label="Shipped units now out of tolerance" className="flex flex-col gap-2">
        <h4 className="font-semibold">Shipped units now out of tolerance ({s.counts.shippedUnits})</h4>
        <div className="rounded-control border border-rule">
          <TableFrame label="Shipped units now out of tolerance">
            <Table caption="Shipped units now out of tolerance">
              <THead>
                <tr>
                  <TH>Unit</TH>
                  <TH>Part</TH>
                  <TH>Shipped</TH>
                  <TH>Order</TH>
                  <TH>Customer</TH>
                </tr>
              </THead>
              <TBody>
                {s.shipped.length === 0 && (
                  <EmptyRow colSpan={5}>No shipped unit holds a part that would now fail.</EmptyRow>
                )}
                {s.shipped.map((u) => (
                  <TR key={`${u.unit}-${u.part}`}>
                    <TD mono>
                      {canTrail ? (
                        <Link className="text-accent underline underline-offset-2" to={trailHref(u.unit)}>
                          {u.unit}
                        </Link>
                      ) : (
                        u.unit
                      )}
                    </TD>
                    <TD mono>{u.part}</TD>
                    <TD mono>{u.shipDate ?? '—'}</TD>
                    <TD mono>{u.reference}</TD>
                    <TD>{u.customer ?? '—'}</TD>
                  </TR>
                ))}
              </TBody>
            </Table>
          </TableFrame>
        </div>
        <div data-density="floor">
          <CsvButton
            filename={`${stem}-shipped.csv`}
            rows={s.shipped}
            columns={[
              { header: 'Unit', text: (u) => u.unit },
              { header: 'Part', text: (u) => u.part },
              { header: 'Ship date', text: (u) => u.shipDate ?? '' },
              { header: 'Order', text: (u) => u.reference },
              { header: 'Customer', text: (u) => u.customer ?? '' },
            ]}
          />
        </div>
      </section>
      {s.truncated && (
        <p className="text-sm text-ink-soft">The lists stop at 500 rows; the counts above are complete.</p>
      )}
    </div>
  );
}
