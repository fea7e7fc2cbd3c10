import type { QueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { Link, useLocation, useParams, type LoaderFunctionArgs } from 'react-router';
import {
  INSPECTION_LABELS,
  INSPECTION_STATES,
  inspectionBody,
  type InspectionBody,
} from '../../../shared/schemas/lots';
import { useSignedIn } from '../../api/auth/me';
import { lotQueryOptions, useLot, useSetInspection } from '../../api/lots/lots';
import { Form, SubmitButton } from '../../components/form';
import { SelectField, TextAreaField } from '../../components/form-fields';
import { PageHeader } from '../../components/page-header';
import { ButtonLink } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Icon } from '../../components/ui/icon';
import { Notice } from '../../components/ui/notice';
import { EmptyRow, Table, TableFrame, TBody, TD, TH, THead, TR } from '../../components/ui/table';
import { itemHref, paths } from '../../lib/paths';
import { requirePermission } from '../../lib/session';
import { InspectionBadge, SameCode } from './lot-words';

const idOf = (raw: string | undefined) => {
  const n = Number(raw);
  return Number.isInteger(n) && n > 0 && n <= 2_147_483_647 ? n : null;
};

export const lotLoader =
  (queryClient: QueryClient) =>
  async ({ request, params }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'lots.read');
    const id = idOf(params.id);
    if (id) await queryClient.prefetchQuery(lotQueryOptions(id));
    return null;
  };

function Fact({ label, children }: { label: string; children: React.ReactNode }) {
  return (
    <div className="flex flex-col gap-0.5">
      <dt className="text-sm text-ink-soft">{label}</dt>
      <dd className="font-medium">{children}</dd>
    </div>
  );
}

function InspectionForm({ id, current, onDone }: { id: number; current: string; onDone: (text: string) => void }) {
  const set = useSetInspection(id);
  const options = INSPECTION_STATES.filter((s) => s !== current).map((s) => ({
    value: s,
    label: INSPECTION_LABELS[s],
  }));
  return (
    <Form
      schema={inspectionBody}
      defaultValues={{ reason: '' }}
      onSubmit={async (body: InspectionBody) => {
        const lot = await set.mutateAsync(body);
        onDone(`Inspection set to ${INSPECTION_LABELS[lot.inspection].toLowerCase()}.`);
      }}
    >
      <div className="grid grid-cols-1 gap-4 md:grid-cols-[16rem_minmax(0,1fr)]">
        <SelectField name="inspection" label="New inspection state" options={options} placeholder="Choose…" optional />
        <TextAreaField
          name="reason"
          label="Why"
          hint="Kept with the lot and its audit trail; a builder refused the lot reads it."
        />
      </div>
      <div>
        <SubmitButton>Change inspection</SubmitButton>
      </div>
    </Form>
  );
}

/** One lot: what came in, its inspection and certificate, and every unit drawn from it. */
export function LotPage() {
  const me = useSignedIn();
  const params = useParams();
  const location = useLocation();
  const id = idOf(params.id);
  const lot = useLot(id ?? 0);
  // said outside the form, which starts afresh for the lot's new state
  const [done, setDone] = useState<string | null>(null);
  if (!me) return null;
  if (!id || lot.error) {
    return (
      <Notice tone="bad" live="alert">
        {lot.error?.message ?? 'No such lot.'}
      </Notice>
    );
  }
  const l = lot.data;
  if (!l) return null;
  const received = (location.state as { received?: boolean } | null)?.received;
  return (
    <div className="mx-auto max-w-page">
      <PageHeader
        title={
          <>
            Lot <span className="font-mono">{l.lotCode}</span>
          </>
        }
        description={`${l.kindLabel}, part number ${l.partNumber}, from ${l.supplier.name}.`}
        actions={<ButtonLink to={paths.receivedLots}>Purchased lots</ButtonLink>}
      />
      <div className="flex flex-col gap-5">
        {received && (
          <Notice tone="ok" live="status">
            Lot {l.lotCode} received: {l.quantityReceived} parts, {INSPECTION_LABELS[l.inspection].toLowerCase()}.
          </Notice>
        )}
        <Card labelledBy="lot-facts">
          <CardHeader id="lot-facts" title="What came in" />
          <CardBody>
            <dl className="grid grid-cols-2 gap-4 md:grid-cols-4">
              <Fact label="Part number">
                <span className="font-mono">{l.partNumber}</span>
              </Fact>
              <Fact label="Lot code">
                <span className="font-mono">{l.lotCode}</span>
                <SameCode lot={l} />
              </Fact>
              <Fact label="Received">
                <span className="font-mono">{l.receivedOn}</span>
                {l.receivedBy && <span className="block text-sm text-ink-soft">by {l.receivedBy}</span>}
              </Fact>
              <Fact label="Left to draw">
                <span className="font-mono">
                  {l.quantityLeft} of {l.quantityReceived}
                </span>
              </Fact>
              <Fact label="Inspection">
                <InspectionBadge state={l.inspection} />
                {l.inspectionReason && <span className="block text-sm text-ink-soft">{l.inspectionReason}</span>}
              </Fact>
              <Fact label="Certificate of conformance">
                {l.certificate ? (
                  <a href={l.certificate.url} className="text-accent underline">
                    {l.certificate.fileName}
                  </a>
                ) : (
                  <span className="text-ink-soft">None on file</span>
                )}
              </Fact>
              {l.oversizeIn !== null && (
                <Fact label="Oversize">
                  <span className="font-mono">+{l.oversizeIn.toFixed(3)} in</span>
                </Fact>
              )}
              <Fact label="Description">{l.description || '—'}</Fact>
            </dl>
            <p className={`mt-4 flex items-start gap-2 ${l.drawable.ok ? 'text-ok' : 'font-medium text-hold'}`}>
              <Icon name={l.drawable.ok ? 'ok' : 'hold'} size={18} className="mt-0.5 shrink-0" />
              {l.drawable.ok ? 'A build can draw from this lot.' : l.drawable.why}
            </p>
          </CardBody>
        </Card>
        {me.can('lots.inspect') && (
          <Card labelledBy="lot-inspection">
            <CardHeader
              id="lot-inspection"
              title="Inspection"
              description="Accept the lot, put it on hold or refuse it. A lot on hold or refused cannot go into a unit."
            />
            <CardBody>
              <div className="flex flex-col gap-3">
                {done && (
                  <p role="status" className="flex items-center gap-2 text-ok">
                    <Icon name="ok" size={18} />
                    {done}
                  </p>
                )}
                <InspectionForm key={l.inspection} id={l.id} current={l.inspection} onDone={setDone} />
              </div>
            </CardBody>
          </Card>
        )}
        <TableFrame label="Units built with this lot">
          <Table caption={`${l.draws.length} unit(s) built with this lot`}>
            <THead>
              <TR>
                <TH>Unit</TH>
                <TH align="right">Parts</TH>
                <TH>When</TH>
                <TH>By</TH>
              </TR>
            </THead>
            <TBody>
              {l.draws.length === 0 && <EmptyRow colSpan={4}>Nothing has been drawn from this lot yet.</EmptyRow>}
              {l.draws.map((d) => (
                <TR key={`${d.unit}-${d.at}`}>
                  <TD mono>
                    <Link to={itemHref(d.unit)} className="text-accent underline">
                      {d.unit}
                    </Link>
                  </TD>
                  <TD mono align="right">
                    {d.quantity}
                  </TD>
                  <TD mono nowrap>
                    {d.at.slice(0, 16).replace('T', ' ')} UTC
                  </TD>
                  <TD>{d.by ?? '—'}</TD>
                </TR>
              ))}
            </TBody>
          </Table>
        </TableFrame>
      </div>
    </div>
  );
}
