import type { QueryClient } from '@tanstack/react-query';
import { createColumnHelper, getCoreRowModel, useReactTable } from '@tanstack/react-table';
import { useState } from 'react';
import type { LoaderFunctionArgs } from 'react-router';
import type { Party } from '../../../../shared/schemas/intake';
import { createPartyBody } from '../../../../shared/schemas/reference';
import { useCreateParty, type CreatedParty, type PartyKind } from '../../../api/reference/create-party';
import { customersQueryOptions, useCustomers } from '../../../api/reference/customers';
import { suppliersQueryOptions, useSuppliers } from '../../../api/reference/suppliers';
import { DataTable } from '../../../components/data-table';
import { Form, SubmitButton } from '../../../components/form';
import { TextField } from '../../../components/form-fields';
import { PageHeader } from '../../../components/page-header';
import { Card, CardBody, CardFooter, CardHeader } from '../../../components/ui/card';
import { Notice } from '../../../components/ui/notice';
import { plural } from '../../../lib/format';
import { requirePermission } from '../../../lib/session';

export const partiesLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'process.edit');
    await Promise.all([
      queryClient.ensureQueryData(customersQueryOptions()),
      queryClient.ensureQueryData(suppliersQueryOptions()),
    ]);
    return null;
  };

const col = createColumnHelper<Party>();
const columns = [
  col.accessor('code', {
    header: 'Code',
    meta: { mono: true, nowrap: true },
    cell: (c) => <span className="font-medium">{c.getValue()}</span>,
  }),
  col.accessor('name', { header: 'Name' }),
];

const WORDS: Record<PartyKind, { one: string; title: string; hint: string; example: string }> = {
  customer: {
    one: 'customer',
    title: 'Customers',
    hint: 'Who returns cores and buys engines; intake, release and notices name them.',
    example: 'e.g. C120',
  },
  supplier: {
    one: 'supplier',
    title: 'Suppliers',
    hint: 'Who sells cores and the purchased lots a build draws from; receiving names them.',
    example: 'e.g. S210',
  },
};

/** One list with its add form above it: codes are short and often added a few at a time. */
function PartyCard({ kind, rows, error }: { kind: PartyKind; rows: Party[]; error: Error | null }) {
  const w = WORDS[kind];
  const create = useCreateParty(kind);
  const [added, setAdded] = useState<CreatedParty | null>(null);
  const [round, setRound] = useState(0);
  // eslint-disable-next-line react-hooks/incompatible-library -- the table instance is rebuilt each render by design
  const table = useReactTable({
    data: rows,
    columns,
    getCoreRowModel: getCoreRowModel(),
    getRowId: (p) => String(p.id),
  });
  const heading = `${kind}s-heading`;
  return (
    <Card labelledBy={heading}>
      <CardHeader id={heading} title={w.title} description={w.hint} />
      <CardBody>
        <div className="flex flex-col gap-3">
          {added && (
            <Notice tone="ok" live="status">
              Added <span className="font-mono font-semibold">{added.code}</span> — {added.name}.
            </Notice>
          )}
          {error && (
            <Notice tone="bad" live="alert">
              {error.message}
            </Notice>
          )}
          <Form
            key={round}
            schema={createPartyBody}
            defaultValues={{ code: '', name: '', email: '' }}
            onSubmit={async (values) => {
              setAdded(null);
              setAdded(await create.mutateAsync(values));
              setRound((r) => r + 1);
            }}
          >
            <div className="grid grid-cols-1 items-start gap-4 md:grid-cols-[10rem_minmax(0,1fr)_minmax(0,1fr)_auto]">
              <TextField
                name="code"
                label={`${w.title.slice(0, -1)} code`}
                mono
                hint={`2–20 letters, digits or dashes, ${w.example}.`}
              />
              <TextField name="name" label={`${w.title.slice(0, -1)} name`} />
              <TextField name="email" label="E-mail" type="email" optional hint="Where notices go." />
              <div className="md:pt-6">
                <SubmitButton>Add {w.one}</SubmitButton>
              </div>
            </div>
          </Form>
        </div>
      </CardBody>
      <DataTable table={table} caption={w.title} empty={`No ${w.one}s yet. Add the first one above.`} />
      <CardFooter>
        <p className="text-sm text-ink-soft" aria-live="polite">
          {plural(rows.length, w.one)}
        </p>
      </CardFooter>
    </Card>
  );
}

export function PartiesPage() {
  const customers = useCustomers();
  const suppliers = useSuppliers();
  return (
    <>
      <PageHeader
        title="Customers and suppliers"
        description="The parties the plant deals with. Each keeps its code for good: cores, lots, units and notices name it."
      />
      <div className="flex flex-col gap-6">
        <PartyCard kind="customer" rows={customers.data ?? []} error={customers.error} />
        <PartyCard kind="supplier" rows={suppliers.data ?? []} error={suppliers.error} />
      </div>
    </>
  );
}
