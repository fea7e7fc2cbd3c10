import { NCR_STATE_LABELS, OPEN_NCR_STATES } from '../../../shared/schemas/ncr';
import type { NcrDetail } from '../../api/ncrs/types';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Icon } from '../../components/ui/icon';
import { formatWhen } from '../../lib/format';

/**
 * Every step the NCR took and every signature on it, newest first: when, who, from which state to
 * which (or what the signature means), and why, each in that person's own words.
 */
export function NcrTimeline({ ncr }: { ncr: NcrDetail }) {
  const entries = [...ncr.timeline].reverse();
  return (
    <Card labelledBy="ncr-timeline-heading">
      <CardHeader id="ncr-timeline-heading" title="Timeline" description="Newest first. Nothing here can be edited." />
      <CardBody>
        <ol className="flex flex-col">
          {entries.map((t, i) => (
            <li
              key={`${t.at}-${t.kind}-${t.to ?? t.actor}`}
              className={`grid grid-cols-1 gap-x-5 gap-y-0.5 py-3 sm:grid-cols-[10rem_minmax(0,1fr)] ${i > 0 ? 'border-t border-rule' : 'pt-0'}`}
            >
              <p className="font-mono text-[0.9rem]">
                <time dateTime={t.at}>{formatWhen(t.at)}</time>
              </p>
              <div className="min-w-0">
                {t.kind === 'signature' ? (
                  <p className="flex flex-wrap items-center gap-x-1.5 font-semibold">
                    <Icon name="key" size={16} className="text-accent" />
                    <span>Signed: {t.meaning}</span>
                    <span className="font-normal text-ink-soft">· {t.actor}</span>
                  </p>
                ) : (
                  <p className="flex flex-wrap items-center gap-x-1.5 font-semibold">
                    {t.from ? (
                      <>
                        <span>{NCR_STATE_LABELS[t.from]}</span>
                        <Icon name="arrowRight" size={16} label="to" />
                      </>
                    ) : null}
                    {t.to && <span>{NCR_STATE_LABELS[t.to]}</span>}
                    <span className="font-normal text-ink-soft">· {t.actor || 'System'}</span>
                  </p>
                )}
                {t.reason && <p className="mt-0.5 whitespace-pre-line text-ink">{t.reason}</p>}
              </div>
            </li>
          ))}
        </ol>
      </CardBody>
    </Card>
  );
}

/** Electronic signatures: the printed name, when, and what the signer meant by signing. */
export function NcrSignatures({ ncr }: { ncr: NcrDetail }) {
  return (
    <Card labelledBy="ncr-signatures-heading">
      <CardHeader id="ncr-signatures-heading" title="Signatures" />
      <CardBody>
        {ncr.signatures.length === 0 ? (
          <p className="text-ink-soft">
            {OPEN_NCR_STATES.includes(ncr.state)
              ? 'Not signed yet. A disposition is signed with the decider’s password.'
              : 'Nothing was signed on this NCR.'}
          </p>
        ) : (
          <ul className="flex flex-col gap-3">
            {ncr.signatures.map((s) => (
              <li key={`${s.signedAt}-${s.printedName}`} className="flex items-start gap-3">
                <Icon name="key" size={20} className="mt-0.5 text-accent" />
                <div>
                  <p className="font-semibold">{s.printedName}</p>
                  <p>{s.meaning}</p>
                  {s.reason && <p className="whitespace-pre-line text-ink-soft">Reason: {s.reason}</p>}
                  <p className="font-mono text-sm text-ink-soft">
                    <time dateTime={s.signedAt}>{formatWhen(s.signedAt, { seconds: true })}</time>
                  </p>
                </div>
              </li>
            ))}
          </ul>
        )}
      </CardBody>
    </Card>
  );
}
