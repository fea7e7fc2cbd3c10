import type { QueryClient } from '@tanstack/react-query';
import type { LoaderFunctionArgs } from 'react-router';
import { ROLE_LABELS, type Role } from '../../../../shared/roles';
import { auditActorsQueryOptions, useAuditActors } from '../../../api/audit/audit-actors';
import { auditEventsQueryOptions, fetchAuditEvents, useAuditEvents } from '../../../api/audit/audit-events';
import { useSignedIn } from '../../../api/auth/me';
import { FilterInput, FilterSelect } from '../../../components/filter-fields';
import { FilteredList, useListFilter } from '../../../components/filtered-list';
import { PageHeader } from '../../../components/page-header';
import { Card, CardBody } from '../../../components/ui/card';
import { Field } from '../../../components/ui/field';
import { Input } from '../../../components/ui/input';
import { downloadCsv, fetchAllPages, toCsv } from '../../../lib/csv';
import { formatWhen } from '../../../lib/format';
import { requirePermission } from '../../../lib/session';
import { useDebouncedText } from '../../../lib/use-url-filter';
import { AuditLogStatus } from './audit-log-status';
import { AuditTable } from './audit-table';
import { AuditVerify } from './audit-verify';
import { AUDIT_FILTERS, auditFilterFrom } from './filter';
import { actionWords, ENTITY_LABELS, recordName } from './words';

export const auditLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'audit.read');
    await Promise.all([
      queryClient.ensureQueryData(auditEventsQueryOptions(auditFilterFrom(new URL(request.url).searchParams))),
      queryClient.ensureQueryData(auditActorsQueryOptions()),
    ]);
    return null;
  };

const entityOptions = Object.entries(ENTITY_LABELS).map(([value, label]) => ({ value, label }));

export function AuditPage() {
  const me = useSignedIn();
  const { filter, filtered, set, setMany, clear } = useListFilter(auditFilterFrom, AUDIT_FILTERS);
  const events = useAuditEvents(filter);
  const actors = useAuditActors().data?.rows ?? [];
  const [entityId, onEntityId] = useDebouncedText(filter.entityId ?? '', (v) => set('entityId', v));
  const actorOptions = actors.map((a) => ({
    value: String(a.id),
    label: `${a.name}, ${ROLE_LABELS[a.role as Role] ?? a.role}${a.active ? '' : ' (left)'}`,
  }));

  const exportEvents = async () => {
    const rows = await fetchAllPages((page, pageSize) => fetchAuditEvents({ ...filter, page, pageSize }));
    const csv = toCsv(rows, [
      { header: 'Event', value: (e) => e.id },
      { header: 'When (UTC)', value: (e) => e.occurredAt },
      { header: 'Who', value: (e) => e.actorName ?? 'System' },
      { header: 'Role', value: (e) => e.actorRole ?? '' },
      { header: 'What happened', value: (e) => actionWords(e.action) },
      { header: 'Action', value: (e) => e.action },
      { header: 'Entity', value: (e) => e.entity },
      { header: 'Entity id', value: (e) => e.entityId },
      { header: 'Record', value: (e) => e.recordLabel ?? recordName(e.entity, e.entityId) },
      { header: 'Before', value: (e) => e.before },
      { header: 'After', value: (e) => e.after },
      { header: 'Log entry', value: (e) => (e.leafIndex === null ? '' : e.leafIndex + 1) },
      { header: 'Chain hash', value: (e) => e.hash ?? '' },
    ]);
    downloadCsv(`coretrail-audit-${formatWhen(new Date().toISOString()).replace(/[ :]/g, '-')}.csv`, csv);
  };

  if (!me) return null;

  return (
    <>
      <PageHeader
        title="Audit trail"
        description="Every change Coretrail records, newest first: who made it, when, and what the record was before and after. Nothing here can be edited."
      />
      <div className="mb-5">
        <Card labelledBy="log-heading">
          <CardBody>
            <h2 id="log-heading" className="mb-3 text-base font-semibold">
              The signed log
            </h2>
            <AuditLogStatus />
            {me.can('audit.verify') && (
              <div className="mt-4 border-t border-rule pt-4">
                <AuditVerify />
              </div>
            )}
          </CardBody>
        </Card>
      </div>
      <FilteredList
        id="events"
        heading="Events"
        searchLabel="Filter events"
        layout="grid grid-cols-1 gap-3 sm:grid-cols-2 lg:grid-cols-[repeat(3,minmax(0,1fr))_minmax(0,0.8fr)_minmax(0,0.8fr)] lg:items-end"
        noun={['event', 'events']}
        list={events}
        filtered={filtered}
        onClear={clear}
        onPage={(p) => set('page', String(p))}
        exportCsv={{ run: exportEvents }}
        filters={
          <>
            <FilterSelect
              id="audit-entity"
              label="Kind of record"
              placeholder="Every kind"
              options={entityOptions}
              value={filter.entity ?? ''}
              onChange={(v) => set('entity', v)}
            />
            <Field id="audit-entity-id" label="Record (serial, number or id)">
              <Input
                id="audit-entity-id"
                mono
                placeholder="e.g. NC-2026-00001"
                value={entityId}
                onChange={(e) => onEntityId(e.target.value)}
              />
            </Field>
            <FilterSelect
              id="audit-actor"
              label="Person"
              placeholder="Everyone"
              options={actorOptions}
              value={filter.actorId ? String(filter.actorId) : ''}
              onChange={(v) => set('actorId', v)}
            />
            <FilterInput
              id="audit-from"
              label="From"
              type="date"
              value={filter.from ?? ''}
              onChange={(v) => set('from', v)}
            />
            <FilterInput id="audit-to" label="To" type="date" value={filter.to ?? ''} onChange={(v) => set('to', v)} />
          </>
        }
      >
        {(data, view) => (
          <AuditTable
            rows={data.rows}
            {...view}
            onActor={(id) => set('actorId', String(id))}
            onRecord={(entity, entityId) => setMany({ entity, entityId })}
          />
        )}
      </FilteredList>
    </>
  );
}
