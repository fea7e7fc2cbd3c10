import { createColumnHelper, getCoreRowModel, useReactTable } from '@tanstack/react-table';
import { useMemo } from 'react';
import type { OutboxStatus } from '../../../../shared/schemas/mail';
import type { OutboxMessage } from '../../../api/mail/outbox';
import { DataTable } from '../../../components/data-table';
import { serverSorting } from '../../../components/filtered-list';
import { Badge, type Tone } from '../../../components/ui/badge';
import { formatWhen } from '../../../lib/format';

/** The events that queue mail (server/services/ncrs/, release/), in words. */
const REASON_WORDS: Record<string, string> = {
  'ncr.raised': 'NCR raised',
  'ncr.decided': 'NCR decided',
  'ncr.countersign_requested': 'Second signature asked for',
  'unit.releasable': 'Unit can ship',
  'field_action.opened': 'Field action opened',
  'field_action.notify_customer': 'Notice to a customer',
  'field_action.recall': 'Recall notice to a customer',
};

export const OUTBOX_STATUS_LABELS: Record<OutboxStatus, string> = {
  pending: 'Waiting',
  sending: 'Sending',
  sent: 'Sent',
  failed: 'Failed',
};
const STATUS_TONES: Record<OutboxStatus, Tone> = { pending: 'wait', sending: 'wait', sent: 'ok', failed: 'bad' };

const col = createColumnHelper<OutboxMessage>();
const none = <span className="text-ink-soft">—</span>;

export function OutboxTable({
  rows,
  busy,
  empty,
  onOpen,
}: {
  rows: OutboxMessage[];
  busy: boolean;
  /** What an empty table says; by default that no message has the chosen status. */
  empty?: string;
  /** Opens the message as it was sent. */
  onOpen: (id: number) => void;
}) {
  const columns = useMemo(
    () => [
      col.accessor('createdAt', {
        header: 'Created',
        meta: { mono: true, nowrap: true },
        cell: (c) => formatWhen(c.getValue()),
      }),
      col.accessor('to', { header: 'To', meta: { nowrap: true } }),
      col.accessor('subject', {
        header: 'Subject',
        cell: (c) => (
          <button
            type="button"
            onClick={() => onOpen(c.row.original.id)}
            className="block min-h-11 floor:min-h-12 min-w-48 text-left text-accent underline underline-offset-4"
          >
            {c.getValue()}
          </button>
        ),
      }),
      col.accessor('reason', {
        header: 'Why it was sent',
        cell: (c) => REASON_WORDS[c.getValue()] ?? c.getValue(),
        meta: { nowrap: true, wideOnly: true },
      }),
      col.accessor('status', {
        header: 'Status',
        cell: (c) => <Badge tone={STATUS_TONES[c.getValue()]}>{OUTBOX_STATUS_LABELS[c.getValue()]}</Badge>,
      }),
      col.accessor('attempts', { header: 'Attempts', meta: { align: 'right', mono: true, wideOnly: true } }),
      col.accessor('lastError', {
        header: 'Last error',
        cell: (c) => {
          const e = c.getValue();
          return e ? <span className="block max-w-72 break-words text-sm text-bad">{e}</span> : none;
        },
      }),
      col.accessor('sentAt', {
        header: 'Sent',
        meta: { mono: true, nowrap: true, wideOnly: true },
        cell: (c) => (c.getValue() ? formatWhen(c.getValue()) : none),
      }),
    ],
    [onOpen],
  );
  // eslint-disable-next-line react-hooks/incompatible-library -- the table instance is rebuilt each render by design
  const table = useReactTable({
    data: rows,
    columns,
    getCoreRowModel: getCoreRowModel(),
    getRowId: (r) => String(r.id),
    ...serverSorting(),
  });
  return <DataTable table={table} caption="Outbox" empty={empty ?? 'No messages with this status.'} busy={busy} />;
}
