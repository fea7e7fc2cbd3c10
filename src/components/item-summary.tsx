import type { ItemJson } from '../api/items/types';
import { useT } from '../lib/i18n';
import { partName } from '../lib/item-status';
import { label } from '../lib/server-messages';
import { StatusBadge } from './item-status';
import { RouteProgress } from './route-progress';

type ItemSummaryProps = { item: ItemJson; serialAs?: 'h1' | 'h2' | 'p' };

/** What an item is and where it stands: the answer to every scan, read at arm's length. */
export function ItemSummary({ item, serialAs: Serial = 'p' }: ItemSummaryProps) {
  const t = useT();
  return (
    <div className="flex flex-col gap-3">
      <div className="flex flex-wrap items-baseline gap-x-5 gap-y-1">
        <Serial className="font-mono text-[2rem] font-semibold leading-tight tracking-wide">{item.serial}</Serial>
        <StatusBadge status={item.status} />
      </div>
      <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 sm:grid-cols-[auto_1fr_auto_1fr]">
        <dt className="text-ink-soft">{t('item.kind')}</dt>
        <dd className="font-medium">
          {partName(label(item.kindLabel), item.positionLabel && label(item.positionLabel))}
        </dd>
        <dt className="text-ink-soft">{t('item.family')}</dt>
        <dd>
          <span className="font-mono font-semibold">{item.family.code}</span> {item.family.name}
        </dd>
      </dl>
      <RouteProgress steps={item.route} />
    </div>
  );
}
