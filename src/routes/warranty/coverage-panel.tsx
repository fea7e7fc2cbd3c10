import { useEffect } from 'react';
import { useFormContext, useWatch } from 'react-hook-form';
import { useCoverage } from '../../api/warranty/coverage';
import { ApiError } from '../../lib/http';
import { Icon } from '../../components/ui/icon';
import { inServiceWords } from './claim-words';

/**
 * Coverage at once, as the desk types: the shipment's own terms against the failure date and the
 * distance, with the reason in words. It fills in the customer the unit shipped to, if none is
 * chosen yet. The server decides again when the claim is logged, and keeps what it said.
 */
export function CoveragePanel() {
  const { setValue, getValues } = useFormContext();
  const [serial, failedOn, distanceKm] = useWatch({ name: ['serial', 'failedOn', 'distanceKm'] }) as [
    string | undefined,
    string | undefined,
    number | null | undefined,
  ];
  const km = typeof distanceKm === 'number' && Number.isFinite(distanceKm) ? distanceKm : null;
  const cover = useCoverage((serial ?? '').trim(), failedOn ?? '', km);
  const shippedTo = cover.data?.shipment.customer?.id;
  useEffect(() => {
    if (shippedTo && !getValues('customerId')) setValue('customerId', shippedTo);
  }, [shippedTo, getValues, setValue]);

  if (!cover.data && !cover.error) {
    return (
      <p className="rounded-control border border-dashed border-rule-strong px-4 py-3 text-ink-soft">
        Scan or type the unit’s serial and the day it failed: whether it is covered shows here.
      </p>
    );
  }
  if (cover.error) {
    return (
      <p role="status" className="rounded-control border-2 border-hold bg-hold-tint px-4 py-3 text-ink">
        {cover.error instanceof ApiError ? cover.error.message : 'Coverage could not be read.'}
      </p>
    );
  }
  const c = cover.data!;
  return (
    <div
      role="status"
      aria-label="Coverage"
      className={`flex items-start gap-3 rounded-card px-4 py-3 ${c.covered ? 'border-2 border-ok bg-ok-tint' : 'border-[3px] border-double border-bad bg-bad-tint'}`}
    >
      <Icon name={c.covered ? 'ok' : 'bad'} size={28} className={c.covered ? 'text-ok' : 'text-bad'} />
      <div>
        <p className={`text-xl font-semibold ${c.covered ? 'text-ok' : 'text-bad'}`}>
          {c.covered ? 'Covered' : 'Not covered'}
        </p>
        <p className="text-ink">{c.reason}</p>
        <p className="mt-1 text-sm text-ink-soft">
          <span className="font-mono">{c.unit.serial}</span> · {c.unit.familyCode} · order{' '}
          <span className="font-mono">{c.shipment.reference}</span> shipped {c.shipment.shipDate}
          {c.shipment.customer ? ` to ${c.shipment.customer.name}` : ''} · {c.months} months
          {c.km !== null ? ` or ${c.km.toLocaleString('en-US')} km` : ''} · in service {inServiceWords(c.daysInService)}
        </p>
      </div>
    </div>
  );
}
