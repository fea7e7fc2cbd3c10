import type { QueryClient } from '@tanstack/react-query';
import { Link, redirect, useParams, type LoaderFunctionArgs } from 'react-router';
import { PART_KIND_LABELS } from '../../../shared/schemas/reference';
import { useSignedIn } from '../../api/auth/me';
import { itemQueryOptions, useItem } from '../../api/items/item';
import { itemResultsQueryOptions } from '../../api/items/results';
import type { RouteStep } from '../../api/items/types';
import { StatusBadge } from '../../components/item-status';
import { RouteProgress } from '../../components/route-progress';
import { ButtonLink, buttonClass } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Notice } from '../../components/ui/notice';
import { partName } from '../../lib/item-status';
import { coreHref, labelsHref, serialHref, stationHref, teardownHref, travellerHref } from '../../lib/paths';
import { canonicalSerial, requireSerial } from '../../lib/serial';
import { requirePermission } from '../../lib/session';
import { PartList } from '../cores/core-sections';
import { ResultsHistory } from './results-history';

export const itemLoader =
  (queryClient: QueryClient) =>
  async ({ request, params }: LoaderFunctionArgs) => {
    const me = await requirePermission(queryClient, request, 'items.read');
    const serial = requireSerial(params.serial);
    // asked for alongside the item; a failure is said in its own section, not as an error page
    const results = queryClient.prefetchQuery(itemResultsQueryOptions(serial));
    const item = await queryClient.ensureQueryData(itemQueryOptions(serial));
    // a core's own page holds its receipt; those who may read intake go there
    if (item.kind === 'core' && me.can('intake.read')) throw redirect(coreHref(item.serial));
    await results;
    return null;
  };

/** The stage that follows the one it is at now (the route itself says where it is now). */
function afterThis(route: RouteStep[]): string | undefined {
  const at = route.findIndex((s) => s.state === 'current');
  if (at < 0) return undefined;
  const next = route.slice(at + 1).find((s) => s.state === 'todo');
  return next ? `After this stage: ${next.name}` : 'This is the last stage of its route.';
}

export function ItemPage() {
  const me = useSignedIn();
  const { data: item } = useItem(canonicalSerial(useParams().serial));
  if (!me || !item) return null;
  const origin = item.harvestedFrom;
  const canIntake = me.can('intake.read');

  return (
    <>
      <div className="mb-5 flex flex-wrap items-end justify-between gap-4">
        <div>
          <p className="text-ink-soft">
            {partName(item.kindLabel, item.positionLabel)} ·{' '}
            <span className="font-mono font-semibold text-ink">{item.family.code}</span> {item.family.name}
          </p>
          <h1 className="font-mono text-[2.5rem] font-semibold leading-tight tracking-wide">{item.serial}</h1>
          <div className="mt-1">
            <StatusBadge status={item.status} />
          </div>
        </div>
        <div className="flex flex-wrap gap-2">
          {item.status === 'in_process' && me.can('station.form') && (
            <ButtonLink to={stationHref(item.serial)} variant="primary" size="lg">
              Record at the station
            </ButtonLink>
          )}
          {item.kind === 'core' && item.status === 'received' && me.can('teardown.record') && (
            <ButtonLink to={teardownHref(item.serial)} variant="primary" size="lg">
              Tear down
            </ButtonLink>
          )}
          {me.can('labels.print') && (
            <ButtonLink to={labelsHref([item.serial])} icon="print" size="lg">
              Print label
            </ButtonLink>
          )}
          {item.kind !== 'core' && item.route.length > 0 && (
            <>
              <a
                href={travellerHref(item.serial, 'a4')}
                target="_blank"
                rel="noopener"
                className={buttonClass('secondary', 'lg')}
              >
                Traveller, A4 (PDF)
              </a>
              <a
                href={travellerHref(item.serial, 'letter')}
                target="_blank"
                rel="noopener"
                className={buttonClass('secondary', 'lg')}
              >
                Traveller, Letter (PDF)
              </a>
            </>
          )}
        </div>
      </div>
      <div className="grid grid-cols-1 items-start gap-5 xl:grid-cols-[minmax(0,1.4fr)_minmax(0,1fr)]">
        <Card labelledBy="route-heading">
          <CardHeader id="route-heading" title="Route" description={afterThis(item.route)} />
          <CardBody>
            <div className="flex flex-col gap-4">
              <RouteProgress steps={item.route} />
              {item.currentStage?.hazard && (
                <Notice tone="hold" title={`Caution at ${item.currentStage.name}`}>
                  {item.currentStage.hazard} This screen does not replace the plant&apos;s procedure.
                </Notice>
              )}
            </div>
          </CardBody>
        </Card>
        <div className="flex flex-col gap-5">
          <Card labelledBy="origin-heading">
            <CardHeader id="origin-heading" title="Where it came from" />
            <CardBody>
              {origin ? (
                <p>
                  Harvested from {PART_KIND_LABELS[origin.kind].toLowerCase()}{' '}
                  <Link
                    to={serialHref(origin.serial, origin.kind, canIntake)}
                    className="font-mono text-lg font-semibold text-accent underline underline-offset-4"
                  >
                    {origin.serial}
                  </Link>
                </p>
              ) : (
                <p className="text-ink-soft">
                  {item.kind === 'core' ? 'A core is where the trail starts.' : 'No core is linked to this item.'}
                </p>
              )}
            </CardBody>
          </Card>
          {item.parts.length > 0 && (
            <Card labelledBy="parts-heading">
              <CardHeader id="parts-heading" title="Parts taken from it" />
              <CardBody>
                <PartList parts={item.parts} />
              </CardBody>
            </Card>
          )}
        </div>
      </div>
      <div className="mt-5">
        <ResultsHistory serial={item.serial} />
      </div>
    </>
  );
}
