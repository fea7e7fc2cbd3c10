import type { QueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import type { LoaderFunctionArgs } from 'react-router';
import { ROLE_LABELS, ROLES } from '../../../../shared/roles';
import { useSignedIn } from '../../../api/auth/me';
import { lockoutsQueryOptions } from '../../../api/lockouts/lockouts';
import { fetchPeople, peopleQueryOptions, usePeople } from '../../../api/people/list-people';
import { PageHeader } from '../../../components/page-header';
import { Pager } from '../../../components/pager';
import { Button } from '../../../components/ui/button';
import { Card, CardFooter } from '../../../components/ui/card';
import { Notice } from '../../../components/ui/notice';
import { downloadCsv, fetchAllPages, toCsv } from '../../../lib/csv';
import { formatWhen } from '../../../lib/format';
import { requirePermission } from '../../../lib/session';
import { useDebouncedText, useUrlFilter } from '../../../lib/use-url-filter';
import { peopleFilterFrom } from './filter';
import { LockoutsCard } from './lockouts-card';
import { AddPersonDialog } from './person-dialogs';
import { PeopleTable } from './people-table';
import { FilterInput, FilterSelect } from '../../../components/filter-fields';

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
  const { params, set: setFilter } = useUrlFilter();
  const filter = peopleFilterFrom(params);
  const people = usePeople(filter);
  const [adding, setAdding] = useState(false);
  const [exporting, setExporting] = useState(false);
  const [draft, onSearch] = useDebouncedText(filter.q ?? '', (v) => setFilter('q', v));

  const onExport = async () => {
    setExporting(true);
    try {
      const rows = await fetchAllPages((page, pageSize) => fetchPeople({ ...filter, page, pageSize }));
      const csv = toCsv(rows, [
        { header: 'Name', value: (p) => p.name },
        { header: 'E-mail', value: (p) => p.email },
        { header: 'Role', value: (p) => ROLE_LABELS[p.role] },
        { header: 'Status', value: (p) => (p.active ? 'Active' : 'Deactivated') },
        { header: 'Last sign-in', value: (p) => formatWhen(p.lastSignInAt) },
      ]);
      downloadCsv('coretrail-people.csv', csv);
    } finally {
      setExporting(false);
    }
  };

  if (!me) return null;
  const data = people.data;

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
      <Card labelledBy="people-list-heading">
        <h2 id="people-list-heading" className="sr-only">
          List of people
        </h2>
        <form
          role="search"
          aria-label="Filter people"
          onSubmit={(e) => e.preventDefault()}
          className="grid grid-cols-1 gap-3 border-b border-rule px-5 py-4 sm:grid-cols-[minmax(0,2fr)_minmax(0,1fr)_minmax(0,1fr)_auto] sm:items-end"
        >
          <FilterInput
            id="people-q"
            label="Search"
            type="search"
            placeholder="Name or e-mail"
            value={draft}
            onChange={(v) => onSearch(v)}
          />
          <FilterSelect
            id="people-role"
            label="Role"
            placeholder="All roles"
            options={roleOptions}
            value={filter.role ?? ''}
            onChange={(v) => setFilter('role', v)}
          />
          <FilterSelect
            id="people-active"
            label="Status"
            placeholder="Any status"
            options={statusOptions}
            value={filter.active ?? ''}
            onChange={(v) => setFilter('active', v)}
          />
          <Button onClick={onExport} disabled={exporting || !data?.total} aria-busy={exporting}>
            Export CSV
          </Button>
        </form>
        {people.error && (
          <div className="px-5 pt-4">
            <Notice tone="bad" live="alert">
              {people.error.message}
            </Notice>
          </div>
        )}
        {data && <PeopleTable rows={data.rows} meId={me.user.id} busy={people.isPlaceholderData} />}
        {data && (
          <CardFooter>
            <Pager
              page={data.page}
              pageSize={data.pageSize}
              total={data.total}
              noun={['person', 'people']}
              onPage={(p) => setFilter('page', String(p))}
            />
          </CardFooter>
        )}
      </Card>
      <AddPersonDialog open={adding} onClose={() => setAdding(false)} />
    </>
  );
}
