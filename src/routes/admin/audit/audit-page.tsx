import type { QueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import type { LoaderFunctionArgs } from 'react-router';
import { auditEventsQueryOptions, fetchAuditEvents, useAuditEvents } from '../../../api/audit/audit-events';
import { useSignedIn } from '../../../api/auth/me';
import { PageHeader } from '../../../components/page-header';
import { Pager } from '../../../components/pager';
import { Button } from '../../../components/ui/button';
import { Card, CardBody, CardFooter } from '../../../components/ui/card';
import { Field } from '../../../components/ui/field';
import { Input } from '../../../components/ui/input';
import { Notice } from '../../../components/ui/notice';
import { downloadCsv, fetchAllPages, toCsv } from '../../../lib/csv';
import { formatWhen } from '../../../lib/format';
import { requirePermission } from '../../../lib/session';
import { useDebouncedText, useUrlFilter } from '../../../lib/use-url-filter';
import { AuditTable } from './audit-table';
import { AuditLogStatus } from './audit-log-status';
import { AuditVerify } from './audit-verify';
import { auditFilterFrom, ENTITY_LABELS } from './filter';
import { FilterSelect } from '../../../components/filter-fields';

export const auditLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'audit.read');
    await queryClient.ensureQueryData(auditEventsQueryOptions(auditFilterFrom(new URL(request.url).searchParams)));
    return null;
  };

const entityOptions = Object.entries(ENTITY_LABELS).map(([value, label]) => ({ value, label: `${label} (${value})` }));

export function AuditPage() {
  const me = useSignedIn();
  const { params, set, setMany } = useUrlFilter();
  const filter = auditFilterFrom(params);
  const events = useAuditEvents(filter);
  const [entityId, onEntityId] = useDebouncedText(filter.entityId ?? '', (v) => set('entityId', v));
  const [exporting, setExporting] = useState(false);
  const data = events.data;
  const actorName = filter.actorId ? data?.rows.find((e) => e.actorId === filter.actorId)?.actorName : undefined;

  const onExport = async () => {
    setExporting(true);
    try {
      const rows = await fetchAllPages((page, pageSize) => fetchAuditEvents({ ...filter, page, pageSize }));
      const csv = toCsv(rows, [
        { header: 'Event', value: (e) => e.id },
        { header: 'When (UTC)', value: (e) => e.occurredAt },
        { header: 'Who', value: (e) => e.actorName ?? 'System' },
        { header: 'Role', value: (e) => e.actorRole ?? '' },
        { header: 'Action', value: (e) => e.action },
        { header: 'Entity', value: (e) => e.entity },
        { header: 'Entity id', value: (e) => e.entityId },
        { header: 'Before', value: (e) => e.before },
        { header: 'After', value: (e) => e.after },
        { header: 'Log entry', value: (e) => (e.leafIndex === null ? '' : e.leafIndex + 1) },
        { header: 'Chain hash', value: (e) => e.hash ?? '' },
      ]);
      downloadCsv(`coretrail-audit-${formatWhen(new Date().toISOString()).replace(/[ :]/g, '-')}.csv`, csv);
    } finally {
      setExporting(false);
    }
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
      <Card labelledBy="events-heading">
        <h2 id="events-heading" className="sr-only">
          Events
        </h2>
        <form
          role="search"
          aria-label="Filter events"
          onSubmit={(e) => e.preventDefault()}
          className="grid grid-cols-1 gap-3 border-b border-rule px-5 py-4 sm:grid-cols-[minmax(0,1fr)_minmax(0,1fr)_auto] sm:items-end"
        >
          <FilterSelect
            id="audit-entity"
            label="Entity"
            placeholder="Any entity"
            options={entityOptions}
            value={filter.entity ?? ''}
            onChange={(v) => set('entity', v)}
          />
          <Field id="audit-entity-id" label="Entity id">
            <Input
              id="audit-entity-id"
              mono
              placeholder="e.g. 12"
              value={entityId}
              onChange={(e) => onEntityId(e.target.value)}
            />
          </Field>
          <Button onClick={onExport} disabled={exporting || !data?.total} aria-busy={exporting}>
            Export CSV
          </Button>
          {filter.actorId && (
            <p className="flex flex-wrap items-center gap-2 text-sm sm:col-span-3">
              Only changes by <span className="font-medium">{actorName ?? `person #${filter.actorId}`}</span>
              <Button size="sm" onClick={() => set('actorId', '')}>
                Show everyone
              </Button>
            </p>
          )}
        </form>
        {events.error && (
          <div className="px-5 pt-4">
            <Notice tone="bad" live="alert">
              {events.error.message}
            </Notice>
          </div>
        )}
        {data && (
          <AuditTable
            rows={data.rows}
            busy={events.isPlaceholderData}
            onActor={(id) => set('actorId', String(id))}
            onRecord={(entity, entityId) => setMany({ entity, entityId })}
          />
        )}
        {data && (
          <CardFooter>
            <Pager
              page={data.page}
              pageSize={data.pageSize}
              total={data.total}
              noun={['event', 'events']}
              onPage={(p) => set('page', String(p))}
            />
          </CardFooter>
        )}
      </Card>
    </>
  );
}
