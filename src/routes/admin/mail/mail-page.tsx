import type { QueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import type { LoaderFunctionArgs } from 'react-router';
import { OUTBOX_STATUSES } from '../../../../shared/schemas/mail';
import { outboxQueryOptions, useOutbox } from '../../../api/mail/outbox';
import { mailSinkQueryOptions, useMailSink } from '../../../api/mail/sink';
import { FilterSelect } from '../../../components/filter-fields';
import { FilteredList, useListFilter } from '../../../components/filtered-list';
import { PageHeader } from '../../../components/page-header';
import { Button } from '../../../components/ui/button';
import { Card, CardHeader } from '../../../components/ui/card';
import { Notice } from '../../../components/ui/notice';
import { requirePermission } from '../../../lib/session';
import { OUTBOX_FILTERS, outboxFilterFrom } from './filter';
import { MessageDialog } from './message-dialog';
import { OUTBOX_STATUS_LABELS, OutboxTable } from './outbox-table';
import { SinkList } from './sink-list';

export const mailLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'mail.read');
    await Promise.all([
      queryClient.ensureQueryData(outboxQueryOptions(outboxFilterFrom(new URL(request.url).searchParams))),
      queryClient.ensureQueryData(mailSinkQueryOptions()),
    ]);
    return null;
  };

const statusOptions = OUTBOX_STATUSES.map((s) => ({ value: s, label: OUTBOX_STATUS_LABELS[s] }));

export function MailPage() {
  const { filter, filtered, set, clear } = useListFilter(outboxFilterFrom, OUTBOX_FILTERS);
  const outbox = useOutbox(filter);
  const sink = useMailSink();
  const [open, setOpen] = useState<number | null>(null);

  return (
    <>
      <PageHeader
        title="Mail"
        description="The messages Coretrail queues (NCRs raised and decided, and the like) and what became of each."
      />
      <div className="flex flex-col gap-5">
        <Notice tone="info" title="Mail stays on this machine">
          In this installation mail goes to a local sink on loopback (127.0.0.1): nothing leaves the machine. What the
          sink received is listed below the outbox.
        </Notice>
        <FilteredList
          id="outbox"
          heading="Outbox"
          header={(id) => (
            <CardHeader
              id={id}
              title="Outbox"
              description="Newest first. A message that fails is tried again; its last error is kept."
            />
          )}
          searchLabel="Filter the outbox"
          layout="grid grid-cols-1 gap-3 sm:grid-cols-[minmax(0,14rem)]"
          noun={['message', 'messages']}
          list={outbox}
          filtered={filtered}
          onClear={clear}
          onPage={(p) => set('page', String(p))}
          emptyUnfiltered="Nothing has been queued yet."
          filters={
            <FilterSelect
              id="outbox-status"
              label="Status"
              placeholder="Any status"
              options={statusOptions}
              value={filter.status ?? ''}
              onChange={(v) => set('status', v)}
            />
          }
        >
          {(data, view) => <OutboxTable rows={data.rows} {...view} onOpen={setOpen} />}
        </FilteredList>
        <Card labelledBy="sink-heading">
          <CardHeader
            id="sink-heading"
            title="Received by the local mail sink"
            description="Newest first. Open a message to read its plain-text body."
            actions={
              <Button
                size="sm"
                onClick={() => void sink.refetch()}
                disabled={sink.isFetching}
                aria-busy={sink.isFetching}
              >
                Check again
              </Button>
            }
          />
          {sink.error && (
            <div className="px-5 py-4">
              <Notice tone="bad" live="alert">
                {sink.error.message}
              </Notice>
            </div>
          )}
          {sink.data && <SinkList messages={sink.data} />}
        </Card>
      </div>
      <MessageDialog id={open} onClose={() => setOpen(null)} />
    </>
  );
}
