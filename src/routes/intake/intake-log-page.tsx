import type { QueryClient } from '@tanstack/react-query';
import type { LoaderFunctionArgs } from 'react-router';
import { GRADE_LABELS, GRADES, SOURCES } from '../../../shared/schemas/intake';
import { useSignedIn } from '../../api/auth/me';
import { intakeLogQueryOptions, useIntakeLog } from '../../api/cores/intake-log';
import { familiesQueryOptions, useFamilies } from '../../api/reference/families';
import { FilterInput, FilterSelect } from '../../components/filter-fields';
import { FilteredList, useListFilter } from '../../components/filtered-list';
import { PageHeader } from '../../components/page-header';
import { ScanBox, useOpenItem } from '../../components/scan-box';
import { ButtonLink } from '../../components/ui/button';
import { Card, CardBody } from '../../components/ui/card';
import { gradeWord, SOURCE_LABELS } from '../../lib/intake-labels';
import { paths } from '../../lib/paths';
import { requirePermission } from '../../lib/session';
import { useDebouncedText } from '../../lib/use-url-filter';
import { INTAKE_FILTERS, intakeExportHref, intakeFilterFrom } from './filter';
import { IntakeTable } from './intake-table';

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

export function IntakeLogPage() {
  const me = useSignedIn();
  const openItem = useOpenItem();
  const { filter, filtered, set, clear, sortBy } = useListFilter(intakeFilterFrom, INTAKE_FILTERS);
  const log = useIntakeLog(filter);
  const families = useFamilies();
  const [draft, onSearch] = useDebouncedText(filter.q ?? '', (v) => set('q', v));
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
      <FilteredList
        id="intake-log"
        heading="Cores received"
        searchLabel="Filter the intake log"
        layout="grid grid-cols-2 gap-3 md:grid-cols-4 xl:grid-cols-6"
        summarySpan="col-span-2 md:col-span-4 xl:col-span-4"
        noun={['core', 'cores']}
        list={log}
        filtered={filtered}
        onClear={clear}
        onPage={(p) => set('page', String(p))}
        exportCsv={{ href: intakeExportHref(filter) }}
        filters={
          <>
            <div className="col-span-2 md:col-span-4 xl:col-span-2">
              <FilterInput
                id="intake-q"
                label="Search"
                type="search"
                placeholder="Serial, casting or ID no., reference"
                value={draft}
                onChange={onSearch}
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
          </>
        }
      >
        {(data, view) => <IntakeTable rows={data.rows} sort={sortBy(filter.sort, filter.dir)} {...view} />}
      </FilteredList>
    </>
  );
}
