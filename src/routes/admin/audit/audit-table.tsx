import { createColumnHelper, getCoreRowModel, useReactTable } from '@tanstack/react-table';
import { useMemo, useState } from 'react';
import type { AuditEvent } from '../../../../shared/schemas/audit';
import { ROLE_LABELS, type Role } from '../../../../shared/roles';
import { DataTable } from '../../../components/data-table';
import { serverSorting } from '../../../components/filtered-list';
import { Icon } from '../../../components/ui/icon';
import { formatWhen } from '../../../lib/format';
import { AuditChange } from './audit-change';
import { actionWords, recordName } from './words';

const col = createColumnHelper<AuditEvent>();

/** "Core CR-…" with the id in the serial's type; a person or a result by its name where the server gives one. */
function RecordName({ event: e }: { event: AuditEvent }) {
  if (e.recordLabel) return <>{e.recordLabel}</>;
  const name = recordName(e.entity, e.entityId);
  const words = name.slice(0, name.length - e.entityId.length);
  // one span: inside the flex button a bare trailing space between the words and the id would collapse
  return (
    <span>
      {words}
      <span className="font-mono">{e.entityId}</span>
    </span>
  );
}
const linkCls =
  'inline-flex min-h-8 items-center text-left text-accent underline-offset-4 hover:underline floor:min-h-12';

type AuditTableProps = {
  rows: AuditEvent[];
  busy: boolean;
  /** What an empty table says; by default that the filters match nothing. */
  empty?: string;
  onActor: (actorId: number) => void;
  onRecord: (entity: string, entityId: string) => void;
};

export function AuditTable({ rows, busy, empty, onActor, onRecord }: AuditTableProps) {
  const [open, setOpen] = useState<Set<number>>(() => new Set());
  const toggle = (id: number) =>
    setOpen((prev) => {
      const next = new Set(prev);
      if (next.has(id)) next.delete(id);
      else next.add(id);
      return next;
    });

  const columns = useMemo(
    () => [
      col.accessor('occurredAt', {
        header: 'When',
        meta: { mono: true, nowrap: true },
        cell: (c) => formatWhen(c.getValue(), { seconds: true }),
      }),
      col.display({
        id: 'who',
        header: 'Who',
        cell: (c) => {
          const e = c.row.original;
          if (e.actorId === null) return <span className="text-ink-soft">Coretrail (system)</span>;
          const actorId = e.actorId;
          return (
            <span className="flex flex-col leading-tight">
              <button
                type="button"
                className={linkCls}
                onClick={() => onActor(actorId)}
                aria-label={`Only changes by ${e.actorName ?? `person #${actorId}`}`}
              >
                {e.actorName ?? `Person #${actorId}`}
              </button>
              {e.actorRole && (
                <span className="text-sm text-ink-soft">{ROLE_LABELS[e.actorRole as Role] ?? e.actorRole}</span>
              )}
            </span>
          );
        },
      }),
      col.accessor('action', {
        header: 'What happened',
        // the code stays in the CSV export, for searching; the screen says it in words
        cell: (c) => actionWords(c.getValue()),
      }),
      col.display({
        id: 'record',
        header: 'Record',
        cell: (c) => {
          const e = c.row.original;
          return (
            <button
              type="button"
              className={linkCls}
              onClick={() => onRecord(e.entity, e.entityId)}
              aria-label={`Only events of ${e.recordLabel ?? recordName(e.entity, e.entityId)}`}
            >
              <RecordName event={e} />
            </button>
          );
        },
      }),
      col.display({
        id: 'change',
        header: () => <span className="sr-only">Before and after</span>,
        meta: { align: 'right', nowrap: true },
        cell: (c) => {
          const id = c.row.original.id;
          const shown = open.has(id);
          return (
            <button
              type="button"
              aria-expanded={shown}
              onClick={() => toggle(id)}
              className="inline-flex h-8 items-center gap-1 rounded-control px-2 text-sm text-accent hover:bg-accent-tint floor:h-12"
            >
              <Icon name={shown ? 'chevronDown' : 'chevronRight'} size={16} />
              {shown ? 'Hide change' : 'Show change'}
            </button>
          );
        },
      }),
    ],
    [open, onActor, onRecord],
  );

  // eslint-disable-next-line react-hooks/incompatible-library -- the table instance is rebuilt each render by design
  const table = useReactTable({
    data: rows,
    columns,
    getCoreRowModel: getCoreRowModel(),
    getRowId: (e) => String(e.id),
    ...serverSorting(),
  });

  return (
    <DataTable
      table={table}
      caption="Audit events, newest first"
      empty={empty ?? 'No events match these filters.'}
      busy={busy}
      expanded={(e) => (open.has(e.id) ? <AuditChange event={e} /> : null)}
    />
  );
}
