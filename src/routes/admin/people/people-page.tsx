import type { QueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import type { LoaderFunctionArgs } from 'react-router';
import { ROLE_LABELS, ROLES } from '../../../../shared/roles';
import { useSignedIn } from '../../../api/auth/me';
import { lockoutsQueryOptions } from '../../../api/lockouts/lockouts';
import { fetchPeople, peopleQueryOptions, usePeople } from '../../../api/people/list-people';
import { FilterInput, FilterSelect } from '../../../components/filter-fields';
import { FilteredList, useListFilter } from '../../../components/filtered-list';
import { PageHeader } from '../../../components/page-header';
import { Button } from '../../../components/ui/button';
import { downloadCsv, fetchAllPages, toCsv } from '../../../lib/csv';
import { formatWhen } from '../../../lib/format';
import { requirePermission } from '../../../lib/session';
import { useDebouncedText } from '../../../lib/use-url-filter';
import { PEOPLE_FILTERS, peopleFilterFrom } from './filter';
import { LockoutsCard } from './lockouts-card';
import { PeopleTable } from './people-table';
import { AddPersonDialog } from './person-dialogs';

export const peopleLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'people.manage');
    await Promise.all([
      queryClient.ensureQueryData(peopleQueryOptions(peopleFilterFrom(new URL(request.url).searchParams))),
      queryClient.ensureQueryData(lockoutsQueryOptions()),
    ]);
    return null;
  };

const roleOptions = ROLES.map((r) => ({ value: r, label: ROLE_LABELS[r] }));
const statusOptions = [
  { value: 'true', label: 'Active' },
  { value: 'false', label: 'Deactivated' },
];

export function PeoplePage() {
  const me = useSignedIn();
  const { filter, filtered, set, clear } = useListFilter(peopleFilterFrom, PEOPLE_FILTERS);
  const people = usePeople(filter);
  const [adding, setAdding] = useState(false);
  const [draft, onSearch] = useDebouncedText(filter.q ?? '', (v) => set('q', v));

  const exportPeople = async () => {
    const rows = await fetchAllPages((page, pageSize) => fetchPeople({ ...filter, page, pageSize }));
    const csv = toCsv(rows, [
      { header: 'Name', value: (p) => p.name },
      { header: 'E-mail', value: (p) => p.email },
      { header: 'Role', value: (p) => ROLE_LABELS[p.role] },
      { header: 'Status', value: (p) => (p.active ? 'Active' : 'Deactivated') },
      { header: 'Last sign-in', value: (p) => formatWhen(p.lastSignInAt) },
    ]);
    downloadCsv('coretrail-people.csv', csv);
  };

  if (!me) return null;

  return (
    <>
      <PageHeader
        title="People"
        description="Everyone who signs in to Coretrail, with the one role that decides what they see and do."
        actions={
          <Button variant="primary" icon="plus" onClick={() => setAdding(true)}>
            Add person
          </Button>
        }
      />
      <div className="mb-5 empty:hidden">
        <LockoutsCard />
      </div>
      <FilteredList
        id="people-list"
        heading="List of people"
        searchLabel="Filter people"
        layout="grid grid-cols-1 gap-3 sm:grid-cols-[minmax(0,2fr)_minmax(0,1fr)_minmax(0,1fr)]"
        noun={['person', 'people']}
        list={people}
        filtered={filtered}
        onClear={clear}
        onPage={(p) => set('page', String(p))}
        exportCsv={{ run: exportPeople }}
        filters={
          <>
            <FilterInput
              id="people-q"
              label="Search"
              type="search"
              placeholder="Name or e-mail"
              value={draft}
              onChange={onSearch}
            />
            <FilterSelect
              id="people-role"
              label="Role"
              placeholder="All roles"
              options={roleOptions}
              value={filter.role ?? ''}
              onChange={(v) => set('role', v)}
            />
            <FilterSelect
              id="people-active"
              label="Status"
              placeholder="Any status"
              options={statusOptions}
              value={filter.active ?? ''}
              onChange={(v) => set('active', v)}
            />
          </>
        }
      >
        {(data, view) => <PeopleTable rows={data.rows} meId={me.user.id} {...view} />}
      </FilteredList>
      <AddPersonDialog open={adding} onClose={() => setAdding(false)} />
    </>
  );
}
