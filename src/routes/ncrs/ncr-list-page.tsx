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
import { FilteredList, useListFilter } from '../../components/filtered-list';
import { PageHeader } from '../../components/page-header';
import { ButtonLink } from '../../components/ui/button';
import { Field } from '../../components/ui/field';
import { Input } from '../../components/ui/input';
import { Select, type OptionGroup } from '../../components/ui/select';
import { paths } from '../../lib/paths';
import { requirePermission } from '../../lib/session';
import { useDebouncedText } from '../../lib/use-url-filter';
import { allDefectOptions } from './defect-options';
import { ALL_STATES, NCR_FILTERS, ncrFilterFrom } from './filter';
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
export function NcrListPage() {
  const me = useSignedIn();
  // "open" is where the list starts, so it does not count as narrowing it
  const { filter, filtered, set, clear, sortBy } = useListFilter(ncrFilterFrom, NCR_FILTERS, { state: 'open' });
  const list = useNcrs(filter);
  const families = useFamilies();
  const stages = useStages();
  const defects = useDefectCodes();
  const [draft, onSearch] = useDebouncedText(filter.q ?? '', (v) => set('q', v));
  const [age, onAge] = useDebouncedText(filter.olderThanDays === undefined ? '' : String(filter.olderThanDays), (v) =>
    set('olderThanDays', /^\d{1,4}$/.test(v) ? v : ''),
  );
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
      <FilteredList
        id="ncr-list"
        heading="Nonconformances"
        searchLabel="Filter the NCRs"
        layout="grid grid-cols-2 gap-3 md:grid-cols-4 xl:grid-cols-6"
        summarySpan="col-span-2 md:col-span-3 xl:col-span-3"
        noun={['NCR', 'NCRs']}
        list={list}
        filtered={filtered}
        onClear={clear}
        onPage={(p) => set('page', String(p))}
        exportCsv={{ href: ncrExportHref(filter) }}
        emptyUnfiltered="No open NCRs: nothing is on hold for quality."
        filters={
          <>
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
          </>
        }
      >
        {(data, view) => (
          <NcrTable
            rows={data.rows}
            canOpenLot={me.can('trail.read')}
            sort={sortBy(filter.sort, filter.dir)}
            {...view}
          />
        )}
      </FilteredList>
    </>
  );
}
