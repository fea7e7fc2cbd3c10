import type { ShipmentJson, WarrantyJson } from '../../../shared/schemas/release';
import { Icon, type IconName } from '../../components/ui/icon';
import { formatGrouped, plural } from '../../lib/format';

type Look = { word: string; icon: IconName; cls: string };

const LOOK: Record<'in' | 'out' | 'none', Look> = {
  in: { word: 'In warranty', icon: 'ok', cls: 'border-2 border-ok bg-ok-tint text-ok' },
  out: { word: 'Out of warranty', icon: 'off', cls: 'border-2 border-dashed border-ink-soft bg-sunk text-ink' },
  none: { word: 'Not shipped', icon: 'wait', cls: 'border-2 border-dashed border-wait bg-wait-tint text-wait' },
};

export const termWords = (w: WarrantyJson) =>
  `${plural(w.months, 'month')}${w.km !== null ? ` or ${formatGrouped(w.km)} km` : ''}`;

/**
 * Where a unit stands under its warranty, in words first: the desk reads this before anything else.
 * `unit` names the long block the warranty belongs to when the serial looked up is one of its parts.
 */
export function WarrantyStatus({
  warranty,
  unit,
  note,
}: {
  warranty: WarrantyJson | null;
  unit?: string | null;
  /** What to say when there is no warranty, in place of "starts on the day it ships". */
  note?: string;
}) {
  const state = !warranty ? 'none' : warranty.inWarranty ? 'in' : 'out';
  const look = LOOK[state];
  return (
    <div className={`flex items-start gap-3 rounded-card px-4 py-3 ${look.cls}`}>
      <Icon name={look.icon} size={30} className="mt-0.5 shrink-0" />
      <div className="min-w-0">
        <p className="text-2xl font-semibold leading-tight">{look.word}</p>
        <div className="mt-1 text-ink">
          {!warranty ? (
            <p>{note ?? 'The warranty starts on the day it ships.'}</p>
          ) : warranty.inWarranty ? (
            <p>
              Ends on <span className="font-mono font-semibold">{warranty.endsOn}</span> ·{' '}
              <span className="font-semibold">{plural(warranty.daysLeft, 'day')} left</span>
            </p>
          ) : (
            <p>
              Ended on <span className="font-mono font-semibold">{warranty.endsOn}</span>
            </p>
          )}
          {warranty && (
            <p className="text-sm text-ink-soft">
              {termWords(warranty)} from <span className="font-mono">{warranty.startsOn}</span>
              {warranty.km !== null ? ', whichever comes first' : ''}
              {unit ? (
                <>
                  ; it follows long block <span className="font-mono">{unit}</span>
                </>
              ) : null}
              .
            </p>
          )}
        </div>
      </div>
    </div>
  );
}

/** Who it went to and when, and the warranty that started with it. */
export function ShipmentFacts({ shipment }: { shipment: ShipmentJson }) {
  const rows: [string, string, boolean][] = [
    ['Customer', shipment.customer ? `${shipment.customer.name} (${shipment.customer.code})` : '—', false],
    ['Order reference', shipment.reference, true],
    ['Ship date', shipment.shipDate, true],
    ['Carrier', shipment.carrier || '—', false],
    ['Released by', shipment.releasedBy || '—', false],
  ];
  return (
    <dl className="grid grid-cols-1 gap-x-6 gap-y-2 sm:grid-cols-2">
      {rows.map(([k, v, mono]) => (
        <div key={k} className="min-w-0">
          <dt className="text-xs font-semibold uppercase tracking-wide text-ink-soft">{k}</dt>
          <dd className={`break-words ${mono ? 'font-mono' : ''}`}>{v}</dd>
        </div>
      ))}
    </dl>
  );
}
