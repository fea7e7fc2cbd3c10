import type { QueryClient } from '@tanstack/react-query';
import type { LoaderFunctionArgs } from 'react-router';
import { NCR_STATE_LABELS, NCR_STATES, SEVERITIES } from '../../../shared/schemas/ncr';
import { PART_KIND_LABELS, type PartKind } from '../../../shared/schemas/reference';
import { useSignedIn } from '../../api/auth/me';
import { defectCodesQueryOptions, useDefectCodes } from '../../api/defect-codes/defect-codes';
import { ncrExportHref, ncrListQueryOptions, useNcrs } from '../../api/ncrs/list-ncrs';
import { familiesQueryOptions, useFamilies } from '../../api/reference/families';
import { stagesQueryOptions, useStages } from '../../api/reference/stages';
import { FilterInput, FilterSelect } from '../../components/filter-fields';
import { PageHeader } from '../../components/page-header';
import { Pager } from '../../components/pager';
import { Button, ButtonLink, buttonClass } from '../../components/ui/button';
import { Card, CardFooter } from '../../components/ui/card';
import { Field } from '../../components/ui/field';
import { Icon } from '../../components/ui/icon';
import { Input } from '../../components/ui/input';
import { Notice } from '../../components/ui/notice';
import { Select, type OptionGroup } from '../../components/ui/select';
import { plural } from '../../lib/format';
import { paths } from '../../lib/paths';
import { requirePermission } from '../../lib/session';
import { useDebouncedText, useUrlFilter } from '../../lib/use-url-filter';
import { allDefectOptions } from './defect-options';
import { ALL_STATES, ncrFilterFrom } from './filter';
import { SEVERITY_LABELS } from './ncr-badges';
import { NcrTable } from './ncr-table';

export const ncrListLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'ncr.read');
    await Promise.all([
      queryClient.ensureQueryData(ncrListQueryOptions(ncrFilterFrom(new URL(request.url).searchParams))),
      queryClient.ensureQueryData(familiesQueryOptions()),
      queryClient.ensureQueryData(stagesQueryOptions()),
      queryClient.ensureQueryData(defectCodesQueryOptions()),
    ]);
    return null;
  };

const stateOptions = [
  { value: 'open', label: 'Open' },
  ...NCR_STATES.map((s) => ({ value: s, label: NCR_STATE_LABELS[s] })),
  { value: ALL_STATES, label: 'Any state' },
];
const severityOptions = SEVERITIES.map((s) => ({ value: s, label: SEVERITY_LABELS[s] }));
const FILTER_KEYS = ['state', 'severity', 'defect', 'family', 'stage', 'olderThanDays', 'assignee', 'q'] as const;

export function NcrListPage() {
  const me = useSignedIn();
  const { params, set, setMany } = useUrlFilter();
  const filter = ncrFilterFrom(params);
  const list = useNcrs(filter);
  const families = useFamilies();
  const stages = useStages();
  const defects = useDefectCodes();
  const [draft, onSearch] = useDebouncedText(filter.q ?? '', (v) => set('q', v));
  const [age, onAge] = useDebouncedText(filter.olderThanDays === undefined ? '' : String(filter.olderThanDays), (v) =>
    set('olderThanDays', /^\d{1,4}$/.test(v) ? v : ''),
  );
  const data = list.data;
  // "open" is where the list starts, so it does not count as narrowing it
  const filtered = FILTER_KEYS.some((k) => (k === 'state' ? filter.state !== 'open' : filter[k] !== undefined));
  const familyOptions = (families.data ?? []).map((f) => ({ value: String(f.id), label: `${f.code} — ${f.name}` }));
  const stageGroups: OptionGroup[] = [];
  for (const s of stages.data ?? []) {
    const label = PART_KIND_LABELS[s.partKind as PartKind] ?? s.partKind;
    let group = stageGroups.find((g) => g.label === label);
    if (!group) stageGroups.push((group = { label, options: [] }));
    group.options.push({ value: s.code, label: s.name });
  }
  const assigneeOptions = [
    { value: 'none', label: 'Nobody' },
    ...(me?.can('ncr.disposition') ? [{ value: String(me.user.id), label: `Me (${me.user.name})` }] : []),
  ];
  // someone else's id from a shared link: the list has no names to offer, but the filter still reads
  if (typeof filter.assignee === 'number' && filter.assignee !== me?.user.id) {
    assigneeOptions.push({ value: String(filter.assignee), label: 'One person (from the link)' });
  }

  if (!me) return null;

  return (
    <>
      <PageHeader
        title="NCRs"
        description="Nonconformances: what was found wrong with a part or a purchased lot, what was decided and by whom. An open NCR holds its part or lot."
        actions={
          me.can('ncr.raise') && (
            <ButtonLink to={paths.raiseConcern} variant="primary" icon="plus">
              Raise a concern
            </ButtonLink>
          )
        }
      />
      <Card labelledBy="ncr-list-heading">
        <h2 id="ncr-list-heading" className="sr-only">
          Nonconformances
        </h2>
        <form
          role="search"
          aria-label="Filter the NCRs"
          onSubmit={(e) => e.preventDefault()}
          className="grid grid-cols-2 gap-3 border-b border-rule px-5 py-4 md:grid-cols-4 xl:grid-cols-6"
        >
          <div className="col-span-2">
            <FilterInput
              id="ncr-q"
              label="Search"
              placeholder="NCR number, serial, lot code or words"
              value={draft}
              onChange={onSearch}
            />
          </div>
          <Field id="ncr-state" label="State">
            <Select
              id="ncr-state"
              options={stateOptions}
              value={filter.state ?? ALL_STATES}
              onChange={(e) => set('state', e.target.value === 'open' ? '' : e.target.value)}
            />
          </Field>
          <FilterSelect
            id="ncr-severity"
            label="Severity"
            placeholder="Any severity"
            options={severityOptions}
            value={filter.severity ?? ''}
            onChange={(v) => set('severity', v)}
          />
          <FilterSelect
            id="ncr-defect"
            label="Defect code"
            placeholder="Any defect"
            options={allDefectOptions(defects.data ?? [])}
            value={filter.defect ?? ''}
            onChange={(v) => set('defect', v)}
          />
          <FilterSelect
            id="ncr-family"
            label="Engine family"
            placeholder="All families"
            options={familyOptions}
            value={filter.family ? String(filter.family) : ''}
            onChange={(v) => set('family', v)}
          />
          <Field id="ncr-stage" label="Stage">
            <Select
              id="ncr-stage"
              placeholder="Any stage"
              groups={stageGroups}
              value={filter.stage ?? ''}
              onChange={(e) => set('stage', e.target.value)}
            />
          </Field>
          <Field id="ncr-older" label="Older than (days)">
            <Input
              id="ncr-older"
              type="text"
              inputMode="numeric"
              mono
              placeholder="e.g. 7"
              value={age}
              onChange={(e) => onAge(e.target.value.replace(/\D/g, '').slice(0, 4))}
            />
          </Field>
          <FilterSelect
            id="ncr-assignee"
            label="Assignee"
            placeholder="Anyone"
            options={assigneeOptions}
            value={filter.assignee === undefined ? '' : String(filter.assignee)}
            onChange={(v) => set('assignee', v)}
          />
          <div className="col-span-2 flex flex-wrap items-end justify-between gap-3 md:col-span-3 xl:col-span-3">
            <p aria-live="polite" className="font-medium">
              {data ? plural(data.total, 'NCR') : '…'}
              {filtered && data && (
                <span className="font-normal text-ink-soft">
                  {' '}
                  {data.total === 1 ? 'matches' : 'match'} these filters
                </span>
              )}
            </p>
            <div className="flex flex-wrap items-center gap-2">
              {filtered && (
                <Button onClick={() => setMany(Object.fromEntries(FILTER_KEYS.map((k) => [k, ''])))}>
                  Clear filters
                </Button>
              )}
              <a
                href={ncrExportHref(filter)}
                download
                className={buttonClass('secondary')}
                aria-disabled={!data?.total || undefined}
              >
                <Icon name="download" />
                Download CSV
              </a>
            </div>
          </div>
        </form>
        {list.error && (
          <div className="px-5 pt-4">
            <Notice tone="bad" live="alert">
              {list.error.message}
            </Notice>
          </div>
        )}
        {data && (
          <NcrTable
            rows={data.rows}
            canOpenLot={me.can('trail.read')}
            busy={list.isPlaceholderData}
            empty={
              data.total > 0
                ? 'Nothing on this page: it is past the last one.'
                : filtered
                  ? undefined
                  : 'No open NCRs: nothing is on hold for quality.'
            }
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
              noun={['NCR', 'NCRs']}
              onPage={(p) => set('page', String(p))}
            />
          </CardFooter>
        )}
      </Card>
    </>
  );
}
