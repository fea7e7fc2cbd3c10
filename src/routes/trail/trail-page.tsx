import type { QueryClient } from '@tanstack/react-query';
import { Link, type LoaderFunctionArgs } from 'react-router';
import { parseSerial } from '../../../shared/domain/serial';
import type { TrailJson } from '../../../shared/schemas/trail';
import { trailQueryOptions, useTrail } from '../../api/trail/trail';
import { StatusBadge } from '../../components/item-status';
import { DataAge } from '../../components/data-age';
import { PageHeader } from '../../components/page-header';
import { ScanBox } from '../../components/scan-box';
import { buttonClass } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Icon } from '../../components/ui/icon';
import { Notice } from '../../components/ui/notice';
import { ApiError } from '../../lib/http';
import { partName } from '../../lib/item-status';
import { buildRecordHref, itemHref, trailHref } from '../../lib/paths';
import { requirePermission } from '../../lib/session';
import { useUrlFilter } from '../../lib/use-url-filter';
import { Genealogy } from './genealogy';
import { LotSearch } from './lot-search';
import { TrailLots } from './trail-lots';
import { TrailNcrs } from './trail-ncrs';
import { TrailResults } from './trail-results';
import { ShipmentFacts, WarrantyStatus } from './warranty';
import { TrailClaims } from './trail-claims';

export const trailLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'trail.read');
    const parsed = parseSerial(new URL(request.url).searchParams.get('serial') ?? '');
    // a serial that cannot be found is said on the page, next to the scan box
    if (parsed.ok) await queryClient.prefetchQuery(trailQueryOptions(parsed.serial));
    return null;
  };

/** Who it is and where it stands under warranty: the desk's first question. */
function Identity({ trail }: { trail: TrailJson }) {
  const { item, tree } = trail;
  const unit = tree.kind === 'long_block' ? tree.serial : null;
  const isUnit = item.kind === 'long_block';
  return (
    <Card labelledBy="identity-heading">
      <div className="grid grid-cols-1 gap-5 px-5 py-4 lg:grid-cols-[minmax(0,1fr)_minmax(0,1fr)]">
        <div className="flex min-w-0 flex-col gap-2">
          <p className="text-ink-soft">
            {partName(item.kindLabel, item.positionLabel)} ·{' '}
            <span className="font-mono font-semibold text-ink">{item.family.code}</span> {item.family.name}
          </p>
          <h2 id="identity-heading" className="font-mono text-[2.5rem] font-semibold leading-tight tracking-wide">
            {item.serial}
          </h2>
          <div className="flex flex-wrap items-center gap-2">
            <StatusBadge status={item.status} />
            {!isUnit && unit && (
              <span className="text-sm text-ink-soft">
                in long block{' '}
                <Link to={trailHref(unit)} className="font-mono text-accent underline-offset-4 hover:underline">
                  {unit}
                </Link>
              </span>
            )}
          </div>
          <div className="mt-1 flex flex-wrap gap-2">
            {unit && (
              <a href={buildRecordHref(unit)} target="_blank" rel="noopener" className={buttonClass('secondary', 'md')}>
                <Icon name="print" size={18} />
                {isUnit ? 'Build record (PDF)' : `Build record of ${unit} (PDF)`}
              </a>
            )}
            <Link to={itemHref(item.serial)} className={buttonClass('quiet', 'md')}>
              Item page
            </Link>
          </div>
        </div>
        <div className="flex flex-col gap-1.5">
          <p className="text-sm font-semibold uppercase tracking-wide text-ink-soft">Warranty</p>
          <WarrantyStatus
            warranty={trail.warranty}
            unit={isUnit ? null : unit}
            note={
              item.kind === 'core'
                ? 'A core does not ship: each unit its parts went into carries its own warranty.'
                : !isUnit && !unit
                  ? 'Not in a long block yet.'
                  : undefined
            }
          />
        </div>
      </div>
    </Card>
  );
}

function Trail({ trail }: { trail: TrailJson }) {
  return (
    <div className="flex flex-col gap-5">
      <Identity trail={trail} />
      <div className="grid grid-cols-1 items-start gap-5 xl:grid-cols-[24rem_minmax(0,1fr)]">
        <div className="flex flex-col gap-5">
          <Card labelledBy="tree-heading">
            <CardHeader id="tree-heading" title="Genealogy" description="Each serial opens its own trail." />
            <CardBody>
              <Genealogy tree={trail.tree} current={trail.item.serial} />
            </CardBody>
          </Card>
          <Card labelledBy="shipment-heading">
            <CardHeader id="shipment-heading" title="Shipment" />
            <CardBody>
              {trail.shipment ? (
                <ShipmentFacts shipment={trail.shipment} />
              ) : (
                <p className="text-ink-soft">Not shipped.</p>
              )}
            </CardBody>
          </Card>
          {trail.tree.kind === 'long_block' && (
            <TrailClaims unit={trail.tree.serial} shipped={trail.item.status === 'shipped'} />
          )}
          {trail.tree.kind === 'long_block' && <TrailLots lots={trail.lots} />}
        </div>
        <div className="flex min-w-0 flex-col gap-5">
          <TrailNcrs ncrs={trail.ncrs} />
          <TrailResults results={trail.results} tree={trail.tree} />
        </div>
      </div>
    </div>
  );
}

export function TrailPage() {
  const { params, setMany } = useUrlFilter();
  const parsed = parseSerial(params.get('serial') ?? '');
  const serial = parsed.ok ? parsed.serial : null;
  const trail = useTrail(serial);
  const data = trail.data && trail.data.item.serial === serial ? trail.data : null;

  return (
    <div className="mx-auto max-w-page">
      <PageHeader
        title="Trail"
        description="Any serial's whole history: what is in it, where it came from, every reading and decision, its shipment and warranty."
      />
      <div className="flex flex-col gap-5">
        <Card labelledBy="lookup-heading">
          <CardHeader id="lookup-heading" title="Look up" />
          <CardBody>
            <div className="grid grid-cols-1 gap-6 xl:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
              <ScanBox
                // a new serial starts with no filters on its results
                onItem={(i) => setMany({ serial: i.serial, part: '', verdict: '', order: '' })}
                preview={false}
                autoFocus={!serial}
                initial={params.get('serial') ?? ''}
                hint="Scan the unit's label, or type any serial — unit, part or core — and press Enter."
              />
              <div className="max-w-xl border-t border-rule pt-4 xl:max-w-none xl:border-l xl:border-t-0 xl:pl-6 xl:pt-0">
                <LotSearch />
              </div>
            </div>
          </CardBody>
        </Card>
        {trail.error ? (
          <Notice
            tone="bad"
            live="alert"
            title={trail.error instanceof ApiError && trail.error.status === 404 ? 'Not found' : undefined}
          >
            {trail.error.message}
          </Notice>
        ) : serial && !data ? (
          <p className="text-ink-soft">Loading the trail of {serial}…</p>
        ) : data ? (
          <>
            <DataAge readFrom={data.readFrom} />
            <Trail trail={data} />
          </>
        ) : null}
      </div>
    </div>
  );
}
