import { Link } from 'react-router';
import { LOT_KIND_LABELS, type LotKind } from '../../../shared/schemas/build';
import { OPEN_NCR_STATES } from '../../../shared/schemas/ncr';
import type { NcrDetail } from '../../api/ncrs/types';
import { Badge, type Tone } from '../../components/ui/badge';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Notice } from '../../components/ui/notice';
import { lotHref } from '../../lib/paths';

type Lot = NonNullable<NcrDetail['lot']>;

const LOT_STATUS: Record<string, { label: string; tone: Tone }> = {
  usable: { label: 'Usable', tone: 'ok' },
  returned: { label: 'Returned to supplier', tone: 'off' },
  scrapped: { label: 'Scrapped', tone: 'bad' },
};

const kindLabel = (kind: string) => LOT_KIND_LABELS[kind as LotKind] ?? kind.replace(/_/g, ' ');

function LotStatus({ status, held }: { status: string; held: boolean }) {
  // an open NCR keeps a usable lot out of units, whatever its own status says
  if (held && status === 'usable') return <Badge tone="hold">Held by this NCR</Badge>;
  const s = LOT_STATUS[status] ?? { label: status.replace(/_/g, ' '), tone: 'neutral' as Tone };
  return <Badge tone={s.tone}>{s.label}</Badge>;
}

/** Which purchased lot the NCR is about, in place of a part's route: a lot has no route to follow. */
export function NcrLot({ ncr, lot, canOpenLot }: { ncr: NcrDetail; lot: Lot; canOpenLot: boolean }) {
  const open = OPEN_NCR_STATES.includes(ncr.state);
  const code = 'font-mono text-[1.75rem] font-semibold leading-tight tracking-wide';
  return (
    <Card labelledBy="ncr-lot-heading">
      <CardHeader
        id="ncr-lot-heading"
        title="The lot"
        description="A purchased lot, not a part the plant remanufactures."
      />
      <CardBody>
        <div className="flex flex-col gap-3">
          <div className="flex flex-wrap items-baseline gap-x-5 gap-y-1">
            {canOpenLot ? (
              <Link
                to={lotHref(lot.lotCode)}
                className={`${code} text-accent underline-offset-4 hover:underline`}
                aria-label={`Lot ${lot.lotCode}: where it was used`}
              >
                {lot.lotCode}
              </Link>
            ) : (
              <p className={code}>{lot.lotCode}</p>
            )}
            <LotStatus status={lot.status} held={open} />
          </div>
          <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 sm:grid-cols-[auto_1fr_auto_1fr]">
            <dt className="text-ink-soft">Kind</dt>
            <dd className="font-medium">{kindLabel(lot.kind)}</dd>
            <dt className="text-ink-soft">Part number</dt>
            <dd className="font-mono">{lot.partNumber}</dd>
            <dt className="text-ink-soft">Supplier</dt>
            <dd className="sm:col-span-3">{lot.supplier || '—'}</dd>
          </dl>
          {open && (
            <Notice tone="hold">
              None of this lot can go into a unit until the NCR is decided. The decision closes the NCR: return to
              supplier or scrap marks the lot returned or scrapped; use as is frees it for building again.
            </Notice>
          )}
        </div>
      </CardBody>
    </Card>
  );
}
