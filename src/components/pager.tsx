import { formatCount as formatGrouped, useT } from '../lib/i18n';
import { Button } from './ui/button';

type PagerProps = {
  page: number;
  pageSize: number;
  total: number;
  onPage: (page: number) => void;
  noun: [string, string];
};

/**
 * "41–60 of 112 people" and the two ways to move; the count is announced as it changes. An
 * address past the last page (an old bookmark, a list that shrank) says so and offers the way
 * back to the last page instead of showing a range that does not exist.
 */
export function Pager({ page, pageSize, total, onPage, noun }: PagerProps) {
  const t = useT();
  const pages = Math.max(1, Math.ceil(total / pageSize));
  const past = page > pages;
  const shown = Math.min(Math.max(1, page), pages);
  const first = total === 0 ? 0 : (shown - 1) * pageSize + 1;
  const last = Math.min(total, shown * pageSize);
  const count = (
    <>
      <span className="font-mono tabular-nums">{formatGrouped(total)}</span> {total === 1 ? noun[0] : noun[1]}
    </>
  );
  return (
    <nav aria-label={t('common.pages')} className="flex w-full flex-wrap items-center justify-between gap-3">
      <p aria-live="polite" className="text-sm text-ink-soft">
        {total === 0 ? (
          t('common.noRows', { noun: noun[1] })
        ) : past ? (
          <>
            {t('common.pastEnd')} {count} {t('common.fitOn')}{' '}
            <span className="font-mono tabular-nums">{formatGrouped(pages)}</span>{' '}
            {pages === 1 ? t('common.page') : t('common.pageMany')}.
          </>
        ) : (
          <>
            <span className="font-mono tabular-nums">
              {formatGrouped(first)}–{formatGrouped(last)}
            </span>{' '}
            {t('common.of')} {count}
          </>
        )}
      </p>
      <div className="flex items-center gap-2">
        {past ? (
          <Button size="sm" variant="primary" icon="chevronLeft" onClick={() => onPage(pages)}>
            {t('common.lastPage')}
          </Button>
        ) : (
          <>
            <Button size="sm" icon="chevronLeft" disabled={page <= 1} onClick={() => onPage(page - 1)}>
              {t('common.previous')}
            </Button>
            <span className="text-sm text-ink-soft">
              {t('common.pageWord')} <span className="font-mono">{shown}</span> {t('common.of')}{' '}
              <span className="font-mono">{pages}</span>
            </span>
            <Button size="sm" disabled={page >= pages} onClick={() => onPage(page + 1)}>
              {t('common.next')}
            </Button>
          </>
        )}
      </div>
    </nav>
  );
}
