import type { QueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { Link, type LoaderFunctionArgs } from 'react-router';
import { parseSerial } from '../../../shared/domain/serial';
import { useSignedIn } from '../../api/auth/me';
import { itemQueryOptions, useItem } from '../../api/items/item';
import type { ItemJson } from '../../api/items/types';
import { customersQueryOptions } from '../../api/reference/customers';
import { trailQueryOptions, useTrail } from '../../api/trail/trail';
import { releaseCheckQueryOptions, useReleaseCheck } from '../../api/release/release-check';
import type { ReleaseReply } from '../../api/release/release-unit';
import { ReleaseDocuments } from './release-documents';
import { ItemSummary } from '../../components/item-summary';
import { PageHeader } from '../../components/page-header';
import { ScanBox } from '../../components/scan-box';
import { ButtonLink } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Notice } from '../../components/ui/notice';
import { itemHref, trailHref } from '../../lib/paths';
import { requirePermission } from '../../lib/session';
import { useUrlFilter } from '../../lib/use-url-filter';
import { ShipmentFacts, WarrantyStatus } from '../trail/warranty';
import { GateChecklist, GateReasons, GateVerdict } from './gate';
import { ReleaseForm } from './release-form';

export const releaseLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    const me = await requirePermission(queryClient, request, 'release.check');
    const parsed = parseSerial(new URL(request.url).searchParams.get('serial') ?? '');
    const customers = me.can('release.ship') ? queryClient.ensureQueryData(customersQueryOptions()) : undefined;
    // a unit that cannot be found is said next to the scan box, not as an error page
    if (parsed.ok) {
      const item = await queryClient.fetchQuery(itemQueryOptions(parsed.serial)).catch(() => null);
      if (item?.kind === 'long_block') {
        await (item.status === 'shipped'
          ? queryClient.prefetchQuery(trailQueryOptions(item.serial))
          : queryClient.prefetchQuery(releaseCheckQueryOptions(item.serial)));
      }
    }
    await customers;
    return null;
  };

function Shipped({ serial, reply }: { serial: string; reply: Pick<ReleaseReply, 'shipment'> }) {
  const canIssue = useSignedIn()?.can('release.ship') ?? false;
  return (
    <Card labelledBy="shipment-heading">
      <CardHeader
        id="shipment-heading"
        title="Shipment"
        description={`${serial} was released on ${reply.shipment.releasedAt.slice(0, 10)}.`}
        actions={
          <ButtonLink to={trailHref(serial)} variant="quiet">
            Its trail
          </ButtonLink>
        }
      />
      <CardBody>
        <div className="flex flex-col gap-4">
          <WarrantyStatus warranty={reply.shipment.warranty} />
          <ShipmentFacts shipment={reply.shipment} />
          <ReleaseDocuments serial={serial} canIssue={canIssue} />
        </div>
      </CardBody>
    </Card>
  );
}

function AlreadyShipped({ serial }: { serial: string }) {
  const trail = useTrail(serial);
  if (trail.error) {
    return (
      <Notice tone="bad" live="alert">
        {trail.error.message}
      </Notice>
    );
  }
  if (!trail.data) return <p className="text-ink-soft">Loading the shipment…</p>;
  const shipment = trail.data.shipment;
  return (
    <div className="flex flex-col gap-4">
      <Notice tone="info" title="Already shipped">
        {serial} has been released; it does not go through the gate again.
      </Notice>
      {shipment && <Shipped serial={serial} reply={{ shipment }} />}
    </div>
  );
}

function Gate({
  unit,
  canShip,
  onShipped,
}: {
  unit: ItemJson;
  canShip: boolean;
  onShipped: (r: ReleaseReply) => void;
}) {
  const check = useReleaseCheck(unit.serial);
  if (check.error) {
    return (
      <Notice tone="bad" live="alert">
        {check.error.message}
      </Notice>
    );
  }
  if (!check.data) return <p className="text-ink-soft">Checking the release gate…</p>;
  const gate = check.data;
  return (
    <div className="flex flex-col gap-5">
      <GateVerdict check={gate} />
      <Card labelledBy="gate-heading">
        <CardHeader
          id="gate-heading"
          title="Release gate"
          description="The unit, every part in it and the cores they came from, and the lots that went in."
        />
        <CardBody>
          <div className="flex flex-col gap-5">
            <GateChecklist check={gate} />
            <GateReasons reasons={gate.reasons} />
          </div>
        </CardBody>
      </Card>
      {gate.releasable &&
        (canShip ? (
          <Card labelledBy="ship-heading">
            <CardHeader
              id="ship-heading"
              title="Release and ship"
              description="The gate is checked once more when you release; the warranty starts on the ship date."
            />
            <CardBody>
              <ReleaseForm serial={unit.serial} onShipped={onShipped} />
            </CardBody>
          </Card>
        ) : (
          <Notice tone="info" title="Shipping releases it">
            It passes the gate. Your role may look at the gate; releasing is for shipping.
          </Notice>
        ))}
    </div>
  );
}

export function ReleasePage() {
  const me = useSignedIn();
  const { params, set } = useUrlFilter();
  const parsed = parseSerial(params.get('serial') ?? '');
  const serial = parsed.ok ? parsed.serial : null;
  const item = useItem(serial);
  const [shipped, setShipped] = useState<{ serial: string; reply: ReleaseReply } | null>(null);
  if (!me) return null;
  const unit = item.data && item.data.serial === serial ? item.data : null;
  const justShipped = shipped && shipped.serial === serial ? shipped : null;

  return (
    <div className="mx-auto max-w-[60rem]">
      <PageHeader
        title="Release"
        description="Scan a finished long block: see every check of the release gate, then release it and record the shipment."
      />
      <div className="flex flex-col gap-5">
        <Card labelledBy="scan-heading">
          <CardHeader id="scan-heading" title="Which unit" />
          <CardBody>
            <div className="flex flex-col gap-5">
              <ScanBox
                onItem={(i) => set('serial', i.serial)}
                preview={false}
                autoFocus={!serial}
                initial={params.get('serial') ?? ''}
                hint="Scan the long block's label, or type its serial and press Enter."
              />
              {unit && (
                <div className="border-t border-rule pt-4">
                  <ItemSummary item={unit} />
                </div>
              )}
            </div>
          </CardBody>
        </Card>
        {item.error && (
          <Notice tone="bad" live="alert">
            {item.error.message}
          </Notice>
        )}
        {justShipped ? (
          <>
            <Notice tone="ok" live="status" title={`${justShipped.serial} released and shipped`}>
              The shipment is recorded and its warranty has started.
            </Notice>
            <Shipped serial={justShipped.serial} reply={justShipped.reply} />
          </>
        ) : unit && unit.kind !== 'long_block' ? (
          <Notice tone="info" title="Not a long block">
            <Link to={itemHref(unit.serial)} className="font-mono text-accent underline">
              {unit.serial}
            </Link>{' '}
            is a {unit.kindLabel.toLowerCase()}. Only a long block goes through the release gate; scan the unit&apos;s
            label.
          </Notice>
        ) : unit && unit.status === 'shipped' ? (
          <AlreadyShipped serial={unit.serial} />
        ) : unit ? (
          <Gate
            unit={unit}
            canShip={me.can('release.ship')}
            onShipped={(reply) => {
              setShipped({ serial: unit.serial, reply });
              window.scrollTo({ top: 0 });
            }}
          />
        ) : null}
      </div>
    </div>
  );
}
