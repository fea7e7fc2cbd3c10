import type { QueryClient } from '@tanstack/react-query';
import { useLocation, useParams, type LoaderFunctionArgs } from 'react-router';
import { useSignedIn } from '../../api/auth/me';
import { coreQueryOptions, useCore } from '../../api/cores/core';
import { StatusBadge } from '../../components/item-status';
import { RouteProgress } from '../../components/route-progress';
import { ButtonLink } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Notice } from '../../components/ui/notice';
import { useT } from '../../lib/i18n';
import { labelsHref, paths, teardownHref } from '../../lib/paths';
import { canonicalSerial, requireSerial } from '../../lib/serial';
import { requirePermission } from '../../lib/session';
import { PartList, PhotoStrip, ReceiptList, TeardownSummary } from './core-sections';
import { CreditSettled } from './credit-settled';
import { coreWords } from './screen-words';

export const coreLoader =
  (queryClient: QueryClient) =>
  async ({ request, params }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'intake.read');
    await Promise.all([queryClient.ensureQueryData(coreQueryOptions(requireSerial(params.serial))), coreWords()]);
    return null;
  };

export function CorePage() {
  const me = useSignedIn();
  const t = useT();
  const serial = canonicalSerial(useParams().serial);
  const { data: core } = useCore(serial);
  const location = useLocation();
  const justReceived = (location.state as { received?: boolean } | null)?.received === true;
  if (!me || !core) return null;
  const parts = core.parts;

  return (
    <>
      {justReceived && (
        <div className="mb-4">
          <Notice
            tone="ok"
            live="status"
            title={core.receipt.accepted ? t('corePage.core.received') : t('corePage.core.rejectedKept')}
          >
            {t('corePage.core.serialIs')} <span className="font-mono font-semibold">{core.serial}</span>.{' '}
            {t('corePage.core.printAndFix')}
          </Notice>
        </div>
      )}
      <div className="mb-5 flex flex-wrap items-end justify-between gap-4">
        <div>
          <p className="text-ink-soft">
            {t('corePage.core.kicker')} · <span className="font-mono font-semibold text-ink">{core.family.code}</span>{' '}
            {core.family.name}
          </p>
          <h1 className="font-mono text-[2.5rem] font-semibold leading-tight tracking-wide">{core.serial}</h1>
          <div className="mt-1">
            <StatusBadge status={core.status} />
          </div>
        </div>
        <div className="flex flex-wrap gap-2">
          {me.can('teardown.record') && core.status === 'received' && (
            <ButtonLink to={teardownHref(core.serial)} variant="primary" size="lg">
              {t('corePage.core.tearDown')}
            </ButtonLink>
          )}
          {me.can('labels.print') && (
            <ButtonLink to={labelsHref([core.serial])} icon="print" size="lg">
              {t('corePage.core.printLabel')}
            </ButtonLink>
          )}
          <ButtonLink to={paths.intake} size="lg">
            {t('corePage.core.intakeLog')}
          </ButtonLink>
        </div>
      </div>
      <div className="grid grid-cols-1 items-start gap-5 xl:grid-cols-[minmax(0,1.25fr)_minmax(0,1fr)]">
        <div className="flex flex-col gap-5">
          <Card labelledBy="receipt-heading">
            <CardHeader id="receipt-heading" title={t('corePage.core.receipt')} />
            <CardBody>
              <ReceiptList core={core} />
            </CardBody>
          </Card>
          <Card labelledBy="photos-heading">
            <CardHeader id="photos-heading" title={t('corePage.core.photos')} />
            <CardBody>
              <PhotoStrip photos={core.photos} />
            </CardBody>
          </Card>
        </div>
        <div className="flex flex-col gap-5">
          <Card labelledBy="route-heading">
            <CardHeader id="route-heading" title={t('corePage.core.route')} />
            <CardBody>
              {core.status === 'rejected' ? (
                <p className="text-ink-soft">{t('corePage.core.rejectedRoute')}</p>
              ) : (
                <RouteProgress steps={core.route} />
              )}
            </CardBody>
          </Card>
          <Card labelledBy="parts-heading">
            <CardHeader
              id="parts-heading"
              title={t('corePage.core.parts')}
              actions={
                parts.length > 0 &&
                me.can('labels.print') && (
                  <ButtonLink to={labelsHref(parts.map((p) => p.serial))} icon="print" size="sm">
                    {t('corePage.core.printParts')}
                  </ButtonLink>
                )
              }
            />
            <CardBody>
              {parts.length > 0 ? (
                <PartList parts={parts} />
              ) : (
                <p className="text-ink-soft">
                  {core.status === 'rejected' ? t('corePage.core.rejectedNotTorn') : t('corePage.core.notTorn')}
                </p>
              )}
            </CardBody>
          </Card>
          {core.receipt.source === 'customer_return' && core.receipt.accepted && (
            <CreditSettled core={core} canRevise={me.can('intake.revise-credit')} />
          )}
          {core.teardown && (
            <Card labelledBy="teardown-heading">
              <CardHeader id="teardown-heading" title={t('corePage.core.teardownRecord')} />
              <CardBody>
                <TeardownSummary record={core.teardown} />
              </CardBody>
            </Card>
          )}
        </div>
      </div>
    </>
  );
}
