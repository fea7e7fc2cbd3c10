import type { UseQueryResult } from '@tanstack/react-query';
import type { OnChangeFn, SortingState } from '@tanstack/react-table';
import { useState, type ReactNode } from 'react';
import type { Paged } from '../../shared/schemas/common';
import { formatCount, useT } from '../lib/i18n';
import { useUrlFilter } from '../lib/use-url-filter';
import { Pager } from './pager';
import { Button, buttonClass } from './ui/button';
import { Card, CardFooter } from './ui/card';
import { Icon } from './ui/icon';
import { Notice } from './ui/notice';

/** The server's sort of a paged list: which column, which way, and how to ask for another. */
export type ListSort = { by: string; dir: 'asc' | 'desc'; onSort: (by: string, dir: 'asc' | 'desc') => void };

/**
 * A list page's filters, read from the address by `parse`. `keys` are the filters "Clear filters"
 * empties; one counts as narrowing the list when it is set to anything but its `usual` value (the
 * NCR list starts on the open ones, which is not a filter a person chose).
 */
export function useListFilter<F extends object>(
  parse: (params: URLSearchParams) => F,
  keys: readonly (keyof F & string)[],
  usual: Partial<F> = {},
) {
  const { params, set, setMany } = useUrlFilter();
  const filter = parse(params);
  const filtered = keys.some((k) => filter[k] !== undefined && filter[k] !== usual[k]);
  const clear = () => setMany(Object.fromEntries(keys.map((k) => [k, ''])));
  const sortBy = (by: string, dir: 'asc' | 'desc'): ListSort => ({
    by,
    dir,
    onSort: (sort, d) => setMany({ sort, dir: d }),
  });
  return { filter, filtered, set, setMany, clear, sortBy };
}

/**
 * The sorting options of a list page's TanStack table, spread into `useReactTable`. Sorting and
 * paging are the server's (the list is paged there): the table only shows which way it is sorted
 * and asks for another order. Without `sort` the list has the server's one order and no heading
 * offers another.
 */
export function serverSorting(sort?: ListSort) {
  const sorting: SortingState = sort ? [{ id: sort.by, desc: sort.dir === 'desc' }] : [];
  const onSortingChange: OnChangeFn<SortingState> = (updater) => {
    const first = (typeof updater === 'function' ? updater(sorting) : updater)[0];
    if (sort && first) sort.onSort(first.id, first.desc ? 'desc' : 'asc');
  };
  return {
    manualSorting: true,
    enableSorting: Boolean(sort),
    enableSortingRemoval: false,
    state: { sorting },
    onSortingChange,
  };
}

/** A server export (a link to the same filters as CSV) or one the page writes itself from every page of rows. */
export type ListExport = { href: string } | { run: () => Promise<void> };

type FilteredListProps<T> = {
  /** Prefix of the ids inside (the heading's is `${id}-heading`). */
  id: string;
  /** The list's name for a screen reader, or the visible heading when `header` draws one with this id. */
  heading: string;
  /** A visible card header; it carries the id `${id}-heading`. */
  header?: (headingId: string) => ReactNode;
  /** The filter form's name, e.g. "Filter the intake log". */
  searchLabel: string;
  /** The grid the filters sit in. */
  layout: string;
  /**
   * The columns the count and buttons span when they fit in the filters' last row (the grid's
   * classes); without it they sit on a row of their own under the filters.
   */
  summarySpan?: string;
  filters: ReactNode;
  noun: [string, string];
  list: UseQueryResult<Paged<T>>;
  filtered: boolean;
  onClear: () => void;
  onPage: (page: number) => void;
  exportCsv?: ListExport;
  /** What the table says when nothing at all is listed and no filter is set. */
  emptyUnfiltered?: string;
  /**
   * The table. `empty` is what it says with no rows: past the last page, nothing at all, or
   * undefined for its own "nothing matches these filters".
   */
  children: (data: Paged<T>, view: { busy: boolean; empty: string | undefined }) => ReactNode;
};

/**
 * The office's list page: filters bound to the address, the count, Clear filters, Export CSV, the
 * server-sorted table and the pager, the same on every list.
 */
export function FilteredList<T>(props: FilteredListProps<T>) {
  const { id, heading, header, searchLabel, layout, filters, noun, list, filtered, onClear, onPage } = props;
  const data = list.data;
  const headingId = `${id}-heading`;
  const t = useT();
  const summary = (place: string) => (
    <div className={`flex flex-wrap justify-between gap-3 ${place}`}>
      <p aria-live="polite" className="font-medium">
        {data ? <Count total={data.total} noun={noun} /> : '…'}
        {filtered && data && (
          <span className="font-normal text-ink-soft">
            {' '}
            {data.total === 1 ? t('common.matchesOne') : t('common.matchesMany')}
          </span>
        )}
      </p>
      <div className="flex flex-wrap items-center gap-2">
        {filtered && <Button onClick={onClear}>{t('common.clearFilters')}</Button>}
        {props.exportCsv && <ExportButton how={props.exportCsv} none={!data?.total} />}
      </div>
    </div>
  );
  const empty = data && data.total > 0 ? t('common.pastLast') : filtered ? undefined : props.emptyUnfiltered;
  return (
    <Card labelledBy={headingId}>
      {header ? (
        header(headingId)
      ) : (
        <h2 id={headingId} className="sr-only">
          {heading}
        </h2>
      )}
      <form
        role="search"
        aria-label={searchLabel}
        onSubmit={(e) => e.preventDefault()}
        className="border-b border-rule px-5 py-4"
      >
        <div className={layout}>
          {filters}
          {props.summarySpan && summary(`${props.summarySpan} items-end`)}
        </div>
        {!props.summarySpan && summary('mt-3 items-center')}
      </form>
      {list.error && (
        <div className="px-5 pt-4">
          <Notice tone="bad" live="alert">
            {list.error.message}
          </Notice>
        </div>
      )}
      {data && props.children(data, { busy: list.isPlaceholderData, empty })}
      {data && (
        <CardFooter>
          <Pager page={data.page} pageSize={data.pageSize} total={data.total} noun={noun} onPage={onPage} />
        </CardFooter>
      )}
    </Card>
  );
}

function Count({ total, noun }: { total: number; noun: [string, string] }) {
  return (
    <>
      <span className="font-mono tabular-nums">{formatCount(total)}</span> {total === 1 ? noun[0] : noun[1]}
    </>
  );
}

function ExportButton({ how, none }: { how: ListExport; none: boolean }) {
  const t = useT();
  const [busy, setBusy] = useState(false);
  if ('href' in how) {
    return (
      <a href={how.href} download className={buttonClass('secondary')} aria-disabled={none || undefined}>
        <Icon name="download" />
        {t('common.exportCsv')}
      </a>
    );
  }
  const run = async () => {
    setBusy(true);
    try {
      await how.run();
    } finally {
      setBusy(false);
    }
  };
  return (
    <Button onClick={() => void run()} disabled={busy || none} aria-busy={busy} icon="download">
      {t('common.exportCsv')}
    </Button>
  );
}
