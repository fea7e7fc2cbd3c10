import { Link } from 'react-router';
import type { NcrDetail } from '../../api/ncrs/types';
import { StatusBadge } from '../../components/item-status';
import { RouteProgress } from '../../components/route-progress';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { partName } from '../../lib/item-status';
import { itemHref } from '../../lib/paths';

/** Which part the NCR is about and where it stands on its route, so the decision is made in context. */
export function NcrPart({ ncr }: { ncr: NcrDetail }) {
  const item = ncr.item;
  return (
    <Card labelledBy="ncr-part-heading">
      <CardHeader id="ncr-part-heading" title="The part" />
      <CardBody>
        {item ? (
          <div className="flex flex-col gap-3">
            <div className="flex flex-wrap items-baseline gap-x-5 gap-y-1">
              <Link
                to={itemHref(item.serial)}
                className="inline-flex items-center font-mono text-[1.75rem] font-semibold leading-tight tracking-wide text-accent underline-offset-4 hover:underline floor:min-h-12"
              >
                {item.serial}
              </Link>
              <StatusBadge status={item.status} />
            </div>
            <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 sm:grid-cols-[auto_1fr_auto_1fr]">
              <dt className="text-ink-soft">Kind</dt>
              <dd className="font-medium">{partName(item.kindLabel, item.positionLabel)}</dd>
              <dt className="text-ink-soft">Family</dt>
              <dd>
                <span className="font-mono font-semibold">{item.family.code}</span> {item.family.name}
              </dd>
            </dl>
            <RouteProgress steps={item.route} />
          </div>
        ) : (
          <p className="text-ink-soft">This NCR is not about a serialized part.</p>
        )}
      </CardBody>
    </Card>
  );
}
