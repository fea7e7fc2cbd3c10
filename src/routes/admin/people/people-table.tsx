import { createColumnHelper, getCoreRowModel, useReactTable } from '@tanstack/react-table';
import { useMemo, useState } from 'react';
import type { Person } from '../../../../shared/schemas/people';
import { ROLE_LABELS } from '../../../../shared/roles';
import { DataTable } from '../../../components/data-table';
import { serverSorting } from '../../../components/filtered-list';
import { Badge } from '../../../components/ui/badge';
import { Button } from '../../../components/ui/button';
import { formatWhen } from '../../../lib/format';
import { EditPersonDialog, ResetPasswordDialog, SetActiveDialog } from './person-dialogs';
import { ResetSecondFactorDialog } from './reset-factor-dialog';

type Open = { kind: 'edit' | 'password' | 'active' | 'factor'; person: Person } | null;

const col = createColumnHelper<Person>();

type PeopleTableProps = { rows: Person[]; meId: number; busy: boolean; empty?: string };

export function PeopleTable({ rows, meId, busy, empty }: PeopleTableProps) {
  const [open, setOpen] = useState<Open>(null);

  const columns = useMemo(
    () => [
      col.accessor('name', {
        header: 'Person',
        cell: (c) => (
          <span className="flex flex-col leading-snug">
            <span className="font-medium">
              {c.getValue()}
              {c.row.original.id === meId && <span className="ml-1.5 text-sm font-normal text-ink-soft">(you)</span>}
            </span>
            <span className="font-mono text-sm text-ink-soft">{c.row.original.email}</span>
          </span>
        ),
      }),
      col.accessor('role', { header: 'Role', cell: (c) => ROLE_LABELS[c.getValue()] }),
      col.accessor('active', {
        header: 'Status',
        cell: (c) => (c.getValue() ? <Badge tone="ok">Active</Badge> : <Badge tone="off">Deactivated</Badge>),
      }),
      col.accessor('secondFactor', {
        header: 'Second factor',
        cell: (c) => (c.getValue() ? <Badge tone="ok">On</Badge> : <span className="text-ink-soft">Off</span>),
        meta: { wideOnly: true },
      }),
      col.accessor('lastSignInAt', {
        header: 'Last sign-in',
        cell: (c) => {
          const when = c.getValue();
          if (!when) return <span className="font-sans text-ink-soft">Never</span>;
          const [date, time] = formatWhen(when).split(' ');
          return (
            <span className="flex flex-col leading-snug">
              <span>{date}</span>
              <span className="text-ink-soft">{time}</span>
            </span>
          );
        },
        meta: { mono: true, nowrap: true, wideOnly: true },
      }),
      col.display({
        id: 'actions',
        header: () => <span className="sr-only">Actions</span>,
        meta: { nowrap: true },
        cell: (c) => {
          const p = c.row.original;
          const self = p.id === meId;
          return (
            <span className="inline-flex items-center gap-1.5">
              <Button size="sm" aria-label={`Edit ${p.name}`} onClick={() => setOpen({ kind: 'edit', person: p })}>
                Edit
              </Button>
              {p.active && (
                <Button
                  size="sm"
                  aria-label={`Reset password for ${p.name}`}
                  onClick={() => setOpen({ kind: 'password', person: p })}
                >
                  Password
                </Button>
              )}
              {p.secondFactor && (
                <Button
                  size="sm"
                  aria-label={`Reset the second factor of ${p.name}`}
                  onClick={() => setOpen({ kind: 'factor', person: p })}
                >
                  Reset 2nd factor
                </Button>
              )}
              {!self &&
                (p.active ? (
                  <Button
                    size="sm"
                    aria-label={`Deactivate ${p.name}`}
                    onClick={() => setOpen({ kind: 'active', person: p })}
                  >
                    Deactivate
                  </Button>
                ) : (
                  <Button
                    size="sm"
                    aria-label={`Reactivate ${p.name}`}
                    onClick={() => setOpen({ kind: 'active', person: p })}
                  >
                    Reactivate
                  </Button>
                ))}
            </span>
          );
        },
      }),
    ],
    [meId],
  );

  // eslint-disable-next-line react-hooks/incompatible-library -- the table instance is rebuilt each render by design
  const table = useReactTable({
    data: rows,
    columns,
    getCoreRowModel: getCoreRowModel(),
    getRowId: (p) => String(p.id),
    ...serverSorting(),
  });
  const close = () => setOpen(null);

  return (
    <>
      <DataTable
        table={table}
        caption="People"
        empty={empty ?? 'Nobody matches these filters.'}
        busy={busy}
        muted={(p) => !p.active}
      />
      {open?.kind === 'edit' && (
        <EditPersonDialog person={open.person} self={open.person.id === meId} onClose={close} />
      )}
      {open?.kind === 'password' && <ResetPasswordDialog person={open.person} onClose={close} />}
      {open?.kind === 'active' && <SetActiveDialog person={open.person} onClose={close} />}
      {open?.kind === 'factor' && <ResetSecondFactorDialog person={open.person} onClose={close} />}
    </>
  );
}
