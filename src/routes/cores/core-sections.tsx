import type { ReactNode } from 'react';
import { Link } from 'react-router';
import { CORE_PART_LABELS, DAMAGE_LABELS, GRADE_LABELS } from '../../../shared/schemas/intake';
import { PART_KIND_LABELS } from '../../../shared/schemas/reference';
import type { CoreDetail, TeardownRecord } from '../../api/cores/types';
import type { ItemPart } from '../../api/items/types';
import { StatusBadge } from '../../components/item-status';
import { Badge } from '../../components/ui/badge';
import { formatWhen } from '../../lib/format';
import { t } from '../../lib/i18n';
import { label } from '../../lib/server-messages';
import { CREDIT_LABELS, SOURCE_LABELS } from '../../lib/intake-labels';
import { partName } from '../../lib/item-status';
import { itemHref } from '../../lib/paths';

function Row({ term, children, mono = false }: { term: string; children: ReactNode; mono?: boolean }) {
  return (
    <>
      <dt className="text-ink-soft">{term}</dt>
      <dd className={mono ? 'font-mono' : ''}>{children ?? '—'}</dd>
    </>
  );
}

const list = (words: string[]) => (words.length ? words.join(', ') : null);

export function ReceiptList({ core }: { core: CoreDetail }) {
  const r = core.receipt;
  const party = r.customer ?? r.supplier;
  const missing = r.condition.missing.map((m) => label(CORE_PART_LABELS[m]));
  const w = (k: string, params?: Record<string, string | number>) => t(`corePage.receipt.${k}`, params);
  return (
    <dl className="grid grid-cols-[minmax(8rem,auto)_1fr] gap-x-5 gap-y-2">
      <Row term={w('castingNumber')} mono>
        {r.castingNumber}
      </Row>
      <Row term={w('idNumber')} mono>
        {r.idNumber}
      </Row>
      <Row term={w('source')}>{label(SOURCE_LABELS[r.source])}</Row>
      <Row term={r.customer ? w('customer') : w('supplier')}>{party && `${party.name} (${party.code})`}</Row>
      <Row term={r.source === 'customer_return' ? w('returnRef') : w('purchaseRef')} mono>
        {r.sourceReference}
      </Row>
      <Row term={w('received')}>{w('by', { day: r.receivedOn, name: r.receivedBy })}</Row>
      <Row term={w('condition')}>
        {r.condition.complete ? w('complete') : w('missing', { list: list(missing) ?? '—' })}
      </Row>
      <Row term={w('damage')}>{list(r.condition.damage.map((d) => label(DAMAGE_LABELS[d]))) ?? w('none')}</Row>
      <Row term={w('grade')}>{r.grade && label(GRADE_LABELS[r.grade])}</Row>
      <Row term={w('decision')}>
        {r.accepted ? (
          <Badge tone="ok">{w('accepted')}</Badge>
        ) : (
          <span className="flex flex-col items-start gap-1">
            <Badge tone="bad">{w('rejected')}</Badge>
            <span>{r.rejectReason}</span>
          </span>
        )}
      </Row>
      {r.source === 'customer_return' && (
        <Row term={w('credit')}>
          {r.creditDecision && label(CREDIT_LABELS[r.creditDecision])}
          {r.creditReason && <span className="block text-ink-soft">{r.creditReason}</span>}
        </Row>
      )}
      {r.notes && <Row term={w('notes')}>{r.notes}</Row>}
    </dl>
  );
}

export function PhotoStrip({ photos }: { photos: CoreDetail['photos'] }) {
  if (photos.length === 0) return <p className="text-ink-soft">{t('corePage.photos.none')}</p>;
  return (
    <ul className="flex flex-wrap gap-3">
      {photos.map((p, i) => (
        <li key={p.id}>
          <a href={p.url} target="_blank" rel="noopener" className="block rounded-control">
            <img
              src={p.url}
              alt={t('corePage.photos.alt', { n: i + 1, file: p.fileName })}
              className="aspect-[4/3] w-44 rounded-control border border-rule-strong bg-sunk object-cover"
            />
          </a>
        </li>
      ))}
    </ul>
  );
}

export function PartList({ parts }: { parts: ItemPart[] }) {
  return (
    <ul className="divide-y divide-rule">
      {parts.map((p) => (
        <li key={p.serial} className="flex flex-wrap items-center gap-x-4 gap-y-1 py-2.5">
          <Link
            to={itemHref(p.serial)}
            className="inline-flex items-center font-mono text-lg font-semibold text-accent underline-offset-4 hover:underline floor:min-h-12"
          >
            {p.serial}
          </Link>
          <span className="font-medium">{partName(p.kindLabel, p.positionLabel)}</span>
          <StatusBadge status={p.status} />
        </li>
      ))}
    </ul>
  );
}

export function TeardownSummary({ record }: { record: TeardownRecord }) {
  return (
    <dl className="grid grid-cols-[minmax(8rem,auto)_1fr] gap-x-5 gap-y-2">
      <Row term={t('corePage.torn.tornDown')}>
        {record.by ? (
          t('corePage.receipt.by', { day: formatWhen(record.at), name: record.by })
        ) : (
          <span className="font-mono">{formatWhen(record.at)}</span>
        )}
      </Row>
      <Row term={t('corePage.torn.kept')}>
        {record.kept.length === 0
          ? t('corePage.torn.nothing')
          : record.kept.map((k) => (
              <span key={k.serial} className="block">
                {partName(label(PART_KIND_LABELS[k.kind]), k.position && label(k.position))}:{' '}
                <Link
                  to={itemHref(k.serial)}
                  className="inline-flex items-center font-mono text-accent underline underline-offset-4 floor:min-h-12"
                >
                  {k.serial}
                </Link>
              </span>
            ))}
      </Row>
      <Row term={t('corePage.torn.scrapped')}>
        {record.scrapped.length === 0
          ? t('corePage.torn.nothing')
          : record.scrapped.map((s, i) => (
              <span key={i} className="block">
                <span className="font-medium">
                  {partName(label(PART_KIND_LABELS[s.kind]), s.position && label(s.position))}
                </span>{' '}
                — {s.reason}
              </span>
            ))}
      </Row>
      <Row term={t('corePage.torn.byRule')}>
        {t('corePage.torn.alwaysReplaced', { list: record.discardedByRule.map(label).join(', ') })}
      </Row>
      {record.notes && <Row term={t('corePage.receipt.notes')}>{record.notes}</Row>}
    </dl>
  );
}
