import type { QueryClient } from '@tanstack/react-query';
import type { LoaderFunctionArgs } from 'react-router';
import { GRADE_LABELS, GRADES, SOURCES } from '../../../shared/schemas/intake';
import { useSignedIn } from '../../api/auth/me';
import { intakeLogQueryOptions, useIntakeLog } from '../../api/cores/intake-log';
import { familiesQueryOptions, useFamilies } from '../../api/reference/families';
import { PageHeader } from '../../components/page-header';
import { Pager } from '../../components/pager';
import { ScanBox, useOpenItem } from '../../components/scan-box';
import { Button, ButtonLink, buttonClass } from '../../components/ui/button';
import { Card, CardBody, CardFooter } from '../../components/ui/card';
import { Icon } from '../../components/ui/icon';
import { Notice } from '../../components/ui/notice';
import { plural } from '../../lib/format';
import { gradeWord, SOURCE_LABELS } from '../../lib/intake-labels';
import { paths } from '../../lib/paths';
import { requirePermission } from '../../lib/session';
import { useDebouncedText, useUrlFilter } from '../../lib/use-url-filter';
import { exportHref, intakeFilterFrom } from './filter';
import { IntakeTable } from './intake-table';
import { FilterInput, FilterSelect } from '../../components/filter-fields';

export const intakeLogLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'intake.read');
    await Promise.all([
      queryClient.ensureQueryData(intakeLogQueryOptions(intakeFilterFrom(new URL(request.url).searchParams))),
      queryClient.ensureQueryData(familiesQueryOptions()),
    ]);
    return null;
  };

const sourceOptions = SOURCES.map((s) => ({ value: s, label: SOURCE_LABELS[s] }));
const gradeOptions = GRADES.map((g) => ({ value: g, label: gradeWord(GRADE_LABELS[g]) }));
const decisionOptions = [
  { value: 'true', label: 'Accepted' },
  { value: 'false', label: 'Rejected' },
];
const FILTER_KEYS = ['q', 'family', 'source', 'grade', 'accepted', 'from', 'to'] as const;

export function IntakeLogPage() {
  const me = useSignedIn();
  const openItem = useOpenItem();
  const { params, set, setMany } = useUrlFilter();
  const filter = intakeFilterFrom(params);
  const log = useIntakeLog(filter);
  const families = useFamilies();
  const [draft, onSearch] = useDebouncedText(filter.q ?? '', (v) => set('q', v));
  const data = log.data;
  const filtered = FILTER_KEYS.some((k) => filter[k] !== undefined);
  const familyOptions = (families.data ?? []).map((f) => ({ value: String(f.id), label: `${f.code} — ${f.name}` }));

  if (!me) return null;

  return (
    <>
      <PageHeader
        title="Intake log"
        description="Every core logged at the dock, accepted or rejected, newest first. Nothing received is ever deleted."
        actions={
          me.can('intake.record') && (
            <ButtonLink to={paths.receiveCore} variant="primary" icon="plus">
              Receive a core
            </ButtonLink>
          )
        }
      />
      <div className="mb-5">
        <Card as="div">
          <CardBody>
            <ScanBox onItem={openItem} preview={false} />
          </CardBody>
        </Card>
      </div>
      <Card labelledBy="intake-log-heading">
        <h2 id="intake-log-heading" className="sr-only">
          Cores received
        </h2>
        <form
          role="search"
          aria-label="Filter the intake log"
          onSubmit={(e) => e.preventDefault()}
          className="grid grid-cols-2 gap-3 border-b border-rule px-5 py-4 md:grid-cols-4 xl:grid-cols-6"
        >
          <div className="col-span-2 md:col-span-4 xl:col-span-2">
            <FilterInput
              id="intake-q"
              label="Search"
              type="search"
              placeholder="Serial, casting or ID no., reference"
              value={draft}
              onChange={(v) => onSearch(v)}
            />
          </div>
          <FilterSelect
            id="intake-family"
            label="Family"
            placeholder="All families"
            options={familyOptions}
            value={filter.family ? String(filter.family) : ''}
            onChange={(v) => set('family', v)}
          />
          <FilterSelect
            id="intake-source"
            label="Source"
            placeholder="Any source"
            options={sourceOptions}
            value={filter.source ?? ''}
            onChange={(v) => set('source', v)}
          />
          <FilterSelect
            id="intake-grade"
            label="Grade"
            placeholder="Any grade"
            options={gradeOptions}
            value={filter.grade ?? ''}
            onChange={(v) => set('grade', v)}
          />
          <FilterSelect
            id="intake-accepted"
            label="Decision"
            placeholder="Either"
            options={decisionOptions}
            value={filter.accepted ?? ''}
            onChange={(v) => set('accepted', v)}
          />
          <FilterInput
            id="intake-from"
            label="Received from"
            type="date"
            value={filter.from ?? ''}
            onChange={(v) => set('from', v)}
          />
          <FilterInput
            id="intake-to"
            label="Received to"
            type="date"
            value={filter.to ?? ''}
            onChange={(v) => set('to', v)}
          />
          <div className="col-span-2 flex flex-wrap items-end justify-between gap-3 md:col-span-4 xl:col-span-4">
            <p aria-live="polite" className="font-medium">
              {data ? plural(data.total, 'core') : '…'}
              {filtered && <span className="font-normal text-ink-soft"> match these filters</span>}
            </p>
            <div className="flex flex-wrap items-center gap-2">
              {filtered && (
                <Button onClick={() => setMany(Object.fromEntries(FILTER_KEYS.map((k) => [k, ''])))}>
                  Clear filters
                </Button>
              )}
              <a
                href={exportHref(filter)}
                download
                className={buttonClass('secondary')}
                aria-disabled={!data?.total || undefined}
              >
                <Icon name="download" />
                Export CSV
              </a>
            </div>
          </div>
        </form>
        {log.error && (
          <div className="px-5 pt-4">
            <Notice tone="bad" live="alert">
              {log.error.message}
            </Notice>
          </div>
        )}
        {data && (
          <IntakeTable
            rows={data.rows}
            busy={log.isPlaceholderData}
            empty={data.total > 0 ? 'Nothing on this page: it is past the last one.' : undefined}
            sort={filter.sort}
            dir={filter.dir}
            onSort={(sort, dir) => setMany({ sort, dir })}
          />
        )}
        {data && (
          <CardFooter>
            <Pager
              page={data.page}
              pageSize={data.pageSize}
              total={data.total}
              noun={['core', 'cores']}
              onPage={(p) => set('page', String(p))}
            />
          </CardFooter>
        )}
      </Card>
    </>
  );
}
