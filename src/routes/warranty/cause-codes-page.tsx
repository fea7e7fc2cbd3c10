import type { QueryClient } from '@tanstack/react-query';
import { createColumnHelper, getCoreRowModel, useReactTable } from '@tanstack/react-table';
import { useMemo, useState } from 'react';
import { Link, type LoaderFunctionArgs } from 'react-router';
import { causeCodeBody, type CauseCodeJson } from '../../../shared/schemas/warranty';
import { useSignedIn } from '../../api/auth/me';
import { causeCodesQueryOptions, useCauseCodes } from '../../api/warranty/cause-codes';
import { useCreateCauseCode } from '../../api/warranty/create-cause-code';
import { useUpdateCauseCode } from '../../api/warranty/update-cause-code';
import { RadioGroupField } from '../../components/choice-fields';
import { ConfirmDialog } from '../../components/confirm-dialog';
import { DataTable } from '../../components/data-table';
import { Form, SubmitButton } from '../../components/form';
import { TextField } from '../../components/form-fields';
import { PageHeader } from '../../components/page-header';
import { Badge } from '../../components/ui/badge';
import { Button } from '../../components/ui/button';
import { Card, CardBody, CardFooter, CardHeader } from '../../components/ui/card';
import { Dialog, DialogActions } from '../../components/ui/dialog';
import { Notice } from '../../components/ui/notice';
import { plural } from '../../lib/format';
import { auditHref } from '../../lib/paths';
import { requirePermission } from '../../lib/session';

export const causeCodesLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'cause-codes.manage');
    await queryClient.ensureQueryData(causeCodesQueryOptions());
    return null;
  };

const COUNTS = [
  { value: true, label: 'Counts as a failure of the product' },
  { value: false, label: 'Not a failure (no trouble found, installation, misuse)' },
];

function AddCauseCode() {
  const create = useCreateCauseCode();
  const [added, setAdded] = useState<CauseCodeJson | null>(null);
  const [round, setRound] = useState(0);
  return (
    <Card labelledBy="add-cause-heading">
      <CardHeader
        id="add-cause-heading"
        title="Add a cause"
        description="Offered at once to the floor when a returned unit is torn down."
      />
      <CardBody>
        <div className="flex flex-col gap-3">
          {added && (
            <Notice tone="ok" live="status">
              Added <span className="font-mono font-semibold">{added.code}</span> — {added.description}.
            </Notice>
          )}
          <Form
            key={round}
            schema={causeCodeBody}
            defaultValues={{ code: '', description: '' }}
            onSubmit={async (values) => {
              setAdded(null);
              setAdded(await create.mutateAsync(values));
              setRound((r) => r + 1);
            }}
          >
            <div className="grid grid-cols-1 items-start gap-4 md:grid-cols-[14rem_minmax(0,1fr)]">
              <TextField
                name="code"
                label="Code"
                mono
                hint="2–20 letters, digits or dashes. It cannot be changed later."
              />
              <TextField name="description" label="Description" hint="The cause, as the teardown bench would say it." />
            </div>
            <RadioGroupField name="countsAsFailure" legend="In the claim rates and the Weibull" options={COUNTS} />
            <div className="flex justify-end">
              <SubmitButton>Add cause</SubmitButton>
            </div>
          </Form>
        </div>
      </CardBody>
    </Card>
  );
}

const editBody = causeCodeBody.pick({ description: true, countsAsFailure: true });

function EditDialog({ code, onClose }: { code: CauseCodeJson; onClose: () => void }) {
  const update = useUpdateCauseCode();
  return (
    <Dialog
      open
      onClose={onClose}
      width="wide"
      title={`Edit cause ${code.code}`}
      description="Findings that already name it show the new wording; a change to whether it counts moves the rates at once."
    >
      <Form
        schema={editBody}
        defaultValues={{ description: code.description, countsAsFailure: code.countsAsFailure }}
        onSubmit={async (body) => {
          await update.mutateAsync({ code: code.code, body });
          onClose();
        }}
      >
        <TextField name="description" label="Description" autoFocus />
        <RadioGroupField name="countsAsFailure" legend="In the claim rates and the Weibull" options={COUNTS} />
        <DialogActions>
          <Button onClick={onClose}>Cancel</Button>
          <SubmitButton>Save</SubmitButton>
        </DialogActions>
      </Form>
    </Dialog>
  );
}

function RetireDialog({ code, onClose }: { code: CauseCodeJson; onClose: () => void }) {
  const update = useUpdateCauseCode();
  const retiring = code.active;
  return (
    <ConfirmDialog
      open
      title={retiring ? `Retire ${code.code}?` : `Bring back ${code.code}?`}
      confirmLabel={retiring ? 'Retire' : 'Bring back'}
      variant={retiring ? 'danger' : 'primary'}
      busy={update.isPending}
      error={update.error}
      onClose={onClose}
      onConfirm={() => update.mutate({ code: code.code, body: { active: !retiring } }, { onSuccess: onClose })}
    >
      {retiring ? (
        <p>
          “{code.description}” will no longer be offered at teardown. Findings that name{' '}
          <span className="font-mono">{code.code}</span> keep it and still count as they did.
        </p>
      ) : (
        <p>“{code.description}” will be offered again at teardown.</p>
      )}
    </ConfirmDialog>
  );
}

type Open = { kind: 'edit' | 'retire'; code: CauseCodeJson } | null;
const col = createColumnHelper<CauseCodeJson>();

/** The plant's own causes for teardown findings, and which of them count as failures of the product. */
export function CauseCodesPage() {
  const me = useSignedIn();
  const codes = useCauseCodes();
  const [open, setOpen] = useState<Open>(null);
  const rows = codes.data ?? [];
  const canAudit = me?.can('audit.read') ?? false;
  const columns = useMemo(
    () => [
      col.accessor('code', {
        header: 'Code',
        meta: { mono: true, nowrap: true },
        cell: (c) => <span className="font-medium">{c.getValue()}</span>,
      }),
      col.accessor('description', { header: 'Description' }),
      col.accessor('countsAsFailure', {
        header: 'Counts as',
        meta: { nowrap: true },
        cell: (c) => (c.getValue() ? <Badge tone="bad">A failure</Badge> : <Badge tone="neutral">Not a failure</Badge>),
      }),
      col.accessor('active', {
        header: 'State',
        meta: { nowrap: true },
        cell: (c) => (c.getValue() ? <Badge tone="ok">Active</Badge> : <Badge tone="off">Retired</Badge>),
      }),
      col.display({
        id: 'actions',
        header: () => <span className="sr-only">Actions</span>,
        meta: { nowrap: true },
        cell: (c) => {
          const d = c.row.original;
          return (
            <span className="inline-flex items-center gap-1.5">
              <Button size="sm" aria-label={`Edit ${d.code}`} onClick={() => setOpen({ kind: 'edit', code: d })}>
                Edit
              </Button>
              <Button
                size="sm"
                aria-label={d.active ? `Retire ${d.code}` : `Bring back ${d.code}`}
                onClick={() => setOpen({ kind: 'retire', code: d })}
              >
                {d.active ? 'Retire' : 'Bring back'}
              </Button>
              {canAudit && (
                <Link
                  to={auditHref({ entity: 'cause_code', entityId: d.code })}
                  className="px-1.5 text-sm text-accent underline-offset-4 hover:underline"
                  aria-label={`History of ${d.code}`}
                >
                  History
                </Link>
              )}
            </span>
          );
        },
      }),
    ],
    [canAudit],
  );
  // eslint-disable-next-line react-hooks/incompatible-library -- the table instance is rebuilt each render by design
  const table = useReactTable({ data: rows, columns, getCoreRowModel: getCoreRowModel(), getRowId: (d) => d.code });
  const close = () => setOpen(null);
  return (
    <>
      <PageHeader
        title="Cause codes"
        description="What a returned unit’s teardown can name as the cause of each finding. A cause is never deleted, because findings name it: retire one that is no longer wanted."
      />
      <div className="flex flex-col gap-5">
        <AddCauseCode />
        <Card labelledBy="causes-heading">
          <h2 id="causes-heading" className="sr-only">
            List of cause codes
          </h2>
          <DataTable table={table} caption="Cause codes" empty="No cause codes yet." muted={(d) => !d.active} />
          <CardFooter>
            <p className="text-sm text-ink-soft" aria-live="polite">
              {plural(rows.length, 'cause')}, {rows.filter((r) => r.active).length} active,{' '}
              {rows.filter((r) => r.countsAsFailure).length} counted as failures
            </p>
          </CardFooter>
        </Card>
      </div>
      {open?.kind === 'edit' && <EditDialog code={open.code} onClose={close} />}
      {open?.kind === 'retire' && <RetireDialog code={open.code} onClose={close} />}
    </>
  );
}
