import { Link } from 'react-router';
import { DISPOSITION_LABELS, NCR_STATE_LABELS, type Disposition } from '../../../shared/schemas/ncr';
import type { TrailNcr } from '../../../shared/schemas/trail';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { formatWhen } from '../../lib/format';
import { lotHref, ncrHref } from '../../lib/paths';
import { NcrStateBadge, SeverityMark } from '../ncrs/ncr-badges';

const dispositionWord = (d: string | null) => (d ? (DISPOSITION_LABELS[d as Disposition] ?? d) : null);

function NcrEntry({ ncr }: { ncr: TrailNcr }) {
  const headingId = `ncr-${ncr.number}`;
  // newest event first, as every detail page reads
  const events = [...ncr.timeline].reverse();
  return (
    <article
      aria-labelledby={headingId}
      className="flex flex-col gap-3 border-b border-rule py-4 first:pt-0 last:border-b-0"
    >
      <header className="flex flex-wrap items-center gap-x-3 gap-y-1.5">
        <h3 id={headingId} className="text-lg font-semibold">
          <Link to={ncrHref(ncr.number)} className="font-mono text-accent underline-offset-4 hover:underline">
            {ncr.number}
          </Link>
        </h3>
        <NcrStateBadge state={ncr.state} />
        <SeverityMark severity={ncr.severity as 'critical' | 'major' | 'minor'} />
        <span className="text-sm text-ink-soft">
          on{' '}
          {ncr.serial ? (
            <span className="font-mono">{ncr.serial}</span>
          ) : ncr.lotCode ? (
            <>
              lot{' '}
              <Link to={lotHref(ncr.lotCode)} className="font-mono text-accent underline">
                {ncr.lotCode}
              </Link>
            </>
          ) : (
            '—'
          )}{' '}
          · raised {formatWhen(ncr.raisedAt)}
        </span>
      </header>
      <p>{ncr.description}</p>
      <p>
        <span className="font-medium">Disposition: </span>
        {dispositionWord(ncr.disposition) ?? <span className="text-ink-soft">not decided yet</span>}
        {ncr.dispositionReason && <> — {ncr.dispositionReason}</>}
      </p>
      <div className="grid grid-cols-1 gap-4 lg:grid-cols-2">
        <div>
          <h4 className="text-sm font-semibold uppercase tracking-wide text-ink-soft">Timeline</h4>
          {events.length ? (
            <ol className="mt-1 flex flex-col gap-1.5">
              {events.map((t, i) => (
                <li key={`${t.at}/${i}`} className="border-l-2 border-rule-strong pl-3">
                  <p>
                    <span className="font-medium">
                      {t.kind === 'signature'
                        ? `Signed: ${t.meaning}`
                        : `${t.from ? `${NCR_STATE_LABELS[t.from]} → ` : ''}${t.to ? NCR_STATE_LABELS[t.to] : ''}`}
                    </span>{' '}
                    <span className="text-ink-soft">
                      · {t.actor || '—'} · <span className="font-mono">{formatWhen(t.at)}</span>
                    </span>
                  </p>
                  {t.reason && <p className="text-sm">{t.reason}</p>}
                </li>
              ))}
            </ol>
          ) : (
            <p className="mt-1 text-ink-soft">No steps yet.</p>
          )}
        </div>
        <div>
          <h4 className="text-sm font-semibold uppercase tracking-wide text-ink-soft">Signatures</h4>
          {ncr.signatures.length ? (
            <ul className="mt-1 flex flex-col gap-1.5">
              {ncr.signatures.map((s, i) => (
                <li key={`${s.signedAt}/${i}`}>
                  <p className="font-medium">{s.printedName}</p>
                  <p className="text-sm">
                    {s.meaning} · <span className="font-mono">{formatWhen(s.signedAt)}</span>
                  </p>
                  {s.reason && <p className="text-sm text-ink-soft">Reason: {s.reason}</p>}
                </li>
              ))}
            </ul>
          ) : (
            <p className="mt-1 text-ink-soft">Not signed.</p>
          )}
        </div>
      </div>
    </article>
  );
}

export function TrailNcrs({ ncrs }: { ncrs: TrailNcr[] }) {
  return (
    <Card labelledBy="ncrs-heading">
      <CardHeader
        id="ncrs-heading"
        title={`NCRs (${ncrs.length})`}
        description={ncrs.length ? 'On the unit, its parts, their cores and the lots that went in.' : undefined}
      />
      <CardBody>
        {ncrs.length ? (
          ncrs.map((n) => <NcrEntry key={n.number} ncr={n} />)
        ) : (
          <p className="text-ink-soft">No nonconformance was raised on anything in this genealogy.</p>
        )}
      </CardBody>
    </Card>
  );
}
