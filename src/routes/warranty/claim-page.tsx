import type { QueryClient } from '@tanstack/react-query';
import { useEffect, useState } from 'react';
import { Link, useLocation, useNavigate, useParams, type LoaderFunctionArgs } from 'react-router';
import { CLAIM_NUMBER, type ClaimJson } from '../../../shared/schemas/warranty';
import { useSignedIn, type SignedIn } from '../../api/auth/me';
import { causeCodesQueryOptions } from '../../api/warranty/cause-codes';
import { claimQueryOptions, useClaim } from '../../api/warranty/claim';
import { StatusBadge } from '../../components/item-status';
import { PageHeader } from '../../components/page-header';
import { Badge } from '../../components/ui/badge';
import { ButtonLink } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Icon } from '../../components/ui/icon';
import { Notice } from '../../components/ui/notice';
import { formatWhen } from '../../lib/format';
import { ApiError } from '../../lib/http';
import { caHref, openCaHref, trailHref } from '../../lib/paths';
import { requirePermission } from '../../lib/session';
import { ClaimStateBadge, CoveredBadge, DecisionBadge, distanceWords, inServiceWords, NEXT_WORDS } from './claim-words';
import { CloseForm, DecideForm, ReturnForm } from './claim-steps';
import { Finding } from './findings';
import { TeardownForm } from './teardown-form';

const canonical = (raw: string | undefined) => (raw ?? '').trim().toUpperCase();

export const claimLoader =
  (queryClient: QueryClient) =>
  async ({ request, params }: LoaderFunctionArgs) => {
    const me = await requirePermission(queryClient, request, 'warranty.read');
    const number = canonical(params.number);
    if (!CLAIM_NUMBER.test(number)) {
      throw new ApiError(400, { code: 'invalid', message: 'A claim number looks like WC-2026-00007.' });
    }
    await Promise.all([
      queryClient.ensureQueryData(claimQueryOptions(number)),
      me.can('warranty.teardown') ? queryClient.ensureQueryData(causeCodesQueryOptions()) : null,
    ]);
    return null;
  };

function Facts({ c, canTrail }: { c: ClaimJson; canTrail: boolean }) {
  const rows: [string, React.ReactNode][] = [
    [
      'Unit',
      <span key="u">
        {canTrail ? (
          <Link to={trailHref(c.unit.serial)} className="font-mono text-accent underline">
            {c.unit.serial}
          </Link>
        ) : (
          <span className="font-mono">{c.unit.serial}</span>
        )}{' '}
        {c.unit.familyCode} <StatusBadge status={c.unit.status} />
      </span>,
    ],
    [
      'Shipped',
      `${c.shipment.shipDate} · order ${c.shipment.reference}${c.shipment.customer ? ` · ${c.shipment.customer}` : ''}`,
    ],
    ['Customer', `${c.customer}${c.customerReference ? ` · their reference ${c.customerReference}` : ''}`],
    ['Failed on', `${c.failedOn} · in service ${inServiceWords(c.daysInService)}`],
    ['Distance · hours', distanceWords(c.distanceKm, c.hours)],
    ['Installed by', c.installer],
  ];
  return (
    <dl className="grid grid-cols-1 gap-x-6 gap-y-2 sm:grid-cols-2 lg:grid-cols-3">
      {rows.map(([k, v]) => (
        <div key={k}>
          <dt className="text-xs font-semibold uppercase tracking-wide text-ink-soft">{k}</dt>
          <dd>{v}</dd>
        </div>
      ))}
      <div className="sm:col-span-2 lg:col-span-3">
        <dt className="text-xs font-semibold uppercase tracking-wide text-ink-soft">What the customer reports</dt>
        <dd className="max-w-prose whitespace-pre-line">{c.symptom}</dd>
      </div>
    </dl>
  );
}

/** The step this claim waits for, as a form for whoever takes it, or in words for everyone else. */
function NextStep({ c, me }: { c: ClaimJson; me: SignedIn }) {
  if (c.next === 'return' && me.can('warranty.return')) return <ReturnForm claim={c} />;
  if (c.next === 'teardown' && me.can('warranty.teardown')) return <TeardownForm claim={c} />;
  if ((c.next === 'decide' || c.next === 'return' || c.next === 'teardown') && me.can('warranty.record')) {
    return c.state === 'received' ? (
      <div className="flex flex-col gap-3">
        <p>
          Waiting for: <span className="font-semibold">{NEXT_WORDS[c.next]}</span>.
        </p>
        <details className="rounded-control border border-rule px-3 py-2">
          <summary className="cursor-pointer font-medium">Reject it now, without a teardown</summary>
          <div className="mt-3">
            <DecideForm claim={c} />
          </div>
        </details>
      </div>
    ) : (
      <DecideForm claim={c} />
    );
  }
  if (c.next === 'close' && me.can('warranty.record')) return <CloseForm claim={c} />;
  if (!c.next) return <p className="text-ink-soft">Closed. Nothing more is done on this claim.</p>;
  return (
    <p>
      Waiting for: <span className="font-semibold">{NEXT_WORDS[c.next]}</span>.
    </p>
  );
}

export function ClaimPage() {
  const me = useSignedIn();
  const { data: c } = useClaim(canonical(useParams().number));
  const location = useLocation();
  const navigate = useNavigate();
  // "logged" is said once: kept for this visit, taken out of the history entry so a reload or a
  // later visit does not say it again
  const [logged] = useState((location.state as { logged?: boolean } | null)?.logged === true);
  useEffect(() => {
    if ((location.state as { logged?: boolean } | null)?.logged) {
      void navigate(location.pathname, { replace: true, state: null });
    }
  }, [location.state, location.pathname, navigate]);
  if (!me || !c) return null;
  return (
    <div className="mx-auto max-w-page">
      {logged && (
        <div className="mb-4">
          <Notice tone="ok" live="status" title={`Claim ${c.number} logged`}>
            Receiving has been told to expect the unit back.
          </Notice>
        </div>
      )}
      <PageHeader
        title={
          <span className="flex flex-wrap items-center gap-x-4 gap-y-2">
            <span className="font-mono tracking-wide">{c.number}</span>
            <span className="flex gap-2 text-base font-normal tracking-normal">
              <ClaimStateBadge state={c.state} />
              <CoveredBadge covered={c.covered} />
              {c.decision && <DecisionBadge decision={c.decision} />}
              {c.demo && (
                <Badge tone="off" icon={null}>
                  Demo history
                </Badge>
              )}
            </span>
          </span>
        }
        description={`Warranty claim on ${c.unit.serial}, logged ${formatWhen(c.openedAt)} by ${c.openedBy}.`}
        actions={
          me.can('corrective-actions.manage') && (
            <ButtonLink to={openCaHref({ claims: [c.number] })} icon="plus">
              Open a corrective action
            </ButtonLink>
          )
        }
      />
      <div className="flex flex-col gap-5">
        <div className="grid grid-cols-1 gap-5 xl:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
          <Card labelledBy="claim-facts">
            <CardHeader id="claim-facts" title="The claim" />
            <CardBody>
              <Facts c={c} canTrail={me.can('trail.read')} />
            </CardBody>
          </Card>
          <Card labelledBy="claim-cover">
            <CardHeader id="claim-cover" title="Coverage when logged" />
            <CardBody>
              <p className="flex items-start gap-2">
                <Icon
                  name={c.coverage.covered ? 'ok' : 'bad'}
                  size={22}
                  className={c.coverage.covered ? 'text-ok' : 'text-bad'}
                />
                <span>{c.coverage.reason}</span>
              </p>
              {c.decisionReason && (
                <div className="mt-3 border-t border-rule pt-3">
                  <p className="text-xs font-semibold uppercase tracking-wide text-ink-soft">Decision</p>
                  <p className="whitespace-pre-line">{c.decisionReason}</p>
                  <p className="text-sm text-ink-soft">
                    {c.decidedBy} · <span className="font-mono">{formatWhen(c.decidedAt)}</span>
                  </p>
                </div>
              )}
            </CardBody>
          </Card>
        </div>
        <Card labelledBy="claim-next">
          <CardHeader id="claim-next" title="Next step" />
          <CardBody>
            <NextStep c={c} me={me} />
          </CardBody>
        </Card>
        <Card labelledBy="claim-findings">
          <CardHeader
            id="claim-findings"
            title="Teardown findings beside the build records"
            description={
              c.tornDownAt
                ? `Torn down ${formatWhen(c.tornDownAt)} by ${c.tornDownBy}. Each finding sits beside what was measured on that part when it was built.`
                : 'Recorded when the returned unit is torn down.'
            }
          />
          {c.findings.length ? (
            <div>
              {c.findings.map((f, i) => (
                <Finding key={f.id} f={f} index={i} canTrail={me.can('trail.read')} />
              ))}
              {c.teardownNotes && (
                <p className="border-t border-rule px-5 py-3 whitespace-pre-line text-ink-soft">{c.teardownNotes}</p>
              )}
            </div>
          ) : (
            <CardBody>
              <p className="text-ink-soft">No findings yet.</p>
            </CardBody>
          )}
        </Card>
        <div className="grid grid-cols-1 gap-5 xl:grid-cols-2">
          <Card labelledBy="claim-signatures">
            <CardHeader id="claim-signatures" title="Signed steps" />
            <CardBody>
              <ol className="flex flex-col gap-3">
                {c.signatures.map((s) => (
                  <li key={`${s.signedAt}-${s.meaning}`} className="flex items-start gap-2.5">
                    <Icon name="key" size={18} className="mt-0.5 shrink-0 text-accent" />
                    <span>
                      <span className="font-semibold">{s.meaning}</span>
                      <span className="block text-sm text-ink-soft">
                        {s.printedName} ·{' '}
                        <time className="font-mono" dateTime={s.signedAt}>
                          {formatWhen(s.signedAt, { seconds: true })}
                        </time>
                        {s.reason ? ` · ${s.reason}` : ''}
                      </span>
                    </span>
                  </li>
                ))}
              </ol>
            </CardBody>
          </Card>
          <Card labelledBy="claim-cas">
            <CardHeader id="claim-cas" title="Corrective actions" />
            <CardBody>
              {c.correctiveActions.length ? (
                <ul className="flex flex-col gap-2">
                  {c.correctiveActions.map((ca) => (
                    <li key={ca.number}>
                      <Link to={caHref(ca.number)} className="font-mono text-accent underline">
                        {ca.number}
                      </Link>{' '}
                      {ca.title}{' '}
                      {ca.state === 'closed' ? <Badge tone="ok">Closed</Badge> : <Badge tone="wait">Open</Badge>}
                    </li>
                  ))}
                </ul>
              ) : (
                <p className="text-ink-soft">None opened from this claim.</p>
              )}
            </CardBody>
          </Card>
        </div>
      </div>
    </div>
  );
}
