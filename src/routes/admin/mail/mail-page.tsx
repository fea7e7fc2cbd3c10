import type { QueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import type { LoaderFunctionArgs } from 'react-router';
import { OUTBOX_STATUSES, outboxQueryOptions, useOutbox, type OutboxFilter } from '../../../api/mail/outbox';
import { mailSinkQueryOptions, useMailSink } from '../../../api/mail/sink';
import { FilterSelect } from '../../../components/filter-fields';
import { PageHeader } from '../../../components/page-header';
import { Pager } from '../../../components/pager';
import { Button } from '../../../components/ui/button';
import { Card, CardFooter, CardHeader } from '../../../components/ui/card';
import { Notice } from '../../../components/ui/notice';
import { plural } from '../../../lib/format';
import { requirePermission } from '../../../lib/session';
import { useUrlFilter } from '../../../lib/use-url-filter';
import { OUTBOX_STATUS_LABELS, OutboxTable } from './outbox-table';
import { MessageDialog } from './message-dialog';
import { SinkList } from './sink-list';

const OUTBOX_PAGE_SIZE = 25;

function outboxFilterFrom(params: URLSearchParams): OutboxFilter {
  const page = Number(params.get('page'));
  const status = OUTBOX_STATUSES.find((s) => s === params.get('status'));
  return {
    page: Number.isInteger(page) && page > 0 ? page : 1,
    pageSize: OUTBOX_PAGE_SIZE,
    ...(status ? { status } : {}),
  };
}

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
  const { params, set } = useUrlFilter();
  const filter = outboxFilterFrom(params);
  const outbox = useOutbox(filter);
  const sink = useMailSink();
  const data = outbox.data;
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
        <Card labelledBy="outbox-heading">
          <CardHeader
            id="outbox-heading"
            title="Outbox"
            description="Newest first. A message that fails is tried again; its last error is kept."
          />
          <form
            role="search"
            aria-label="Filter the outbox"
            onSubmit={(e) => e.preventDefault()}
            className="flex flex-wrap items-end justify-between gap-3 border-b border-rule px-5 py-4"
          >
            <div className="w-56">
              <FilterSelect
                id="outbox-status"
                label="Status"
                placeholder="Any status"
                options={statusOptions}
                value={filter.status ?? ''}
                onChange={(v) => set('status', v)}
              />
            </div>
            <p aria-live="polite" className="font-medium">
              {data ? plural(data.total, 'message') : '…'}
            </p>
          </form>
          {outbox.error && (
            <div className="px-5 pt-4">
              <Notice tone="bad" live="alert">
                {outbox.error.message}
              </Notice>
            </div>
          )}
          {data && (
            <OutboxTable
              rows={data.rows}
              busy={outbox.isPlaceholderData}
              empty={
                data.total > 0
                  ? 'Nothing on this page: it is past the last one.'
                  : filter.status
                    ? 'No messages with this status.'
                    : 'Nothing has been queued yet.'
              }
              onOpen={setOpen}
            />
          )}
          {data && (
            <CardFooter>
              <Pager
                page={data.page}
                pageSize={data.pageSize}
                total={data.total}
                noun={['message', 'messages']}
                onPage={(p) => set('page', String(p))}
              />
            </CardFooter>
          )}
        </Card>
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
