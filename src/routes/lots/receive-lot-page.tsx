import type { QueryClient } from '@tanstack/react-query';
import { useNavigate, type LoaderFunctionArgs } from 'react-router';
import { useEffect } from 'react';
import { useFormContext, useWatch } from 'react-hook-form';
import { LOT_KIND_LABELS, LOT_KINDS } from '../../../shared/schemas/build';
import {
  INSPECTION_LABELS,
  INSPECTION_STATES,
  receiveLotBody,
  type ReceiveLotBody,
} from '../../../shared/schemas/lots';
import { useSignedIn } from '../../api/auth/me';
import { useReceiveLot } from '../../api/lots/lots';
import { suppliersQueryOptions, useSuppliers } from '../../api/reference/suppliers';
import { Form, SubmitButton } from '../../components/form';
import { NumberField, SelectField, TextAreaField, TextField } from '../../components/form-fields';
import { PageHeader } from '../../components/page-header';
import { ButtonLink } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { paths, receivedLotHref } from '../../lib/paths';
import { requirePermission } from '../../lib/session';
import { CertificateField } from './certificate-field';

export const receiveLotLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'lots.receive');
    await queryClient.ensureQueryData(suppliersQueryOptions());
    return null;
  };

/** Today on the dock's own calendar, not UTC's. */
function today(): string {
  const d = new Date();
  const pad = (n: number) => String(n).padStart(2, '0');
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}`;
}

const kindOptions = LOT_KINDS.map((k) => ({ value: k, label: LOT_KIND_LABELS[k] }));
const inspectionOptions = INSPECTION_STATES.map((s) => ({ value: s, label: INSPECTION_LABELS[s] }));

/** Oversize for pistons, a reason for a lot held or refused: asked only when it applies. */
function Conditional() {
  const kind = useWatch({ name: 'kind' }) as string | undefined;
  const inspection = useWatch({ name: 'inspection' }) as string | undefined;
  const { unregister } = useFormContext();
  // a field no longer shown is no longer sent (an oversize typed before the part was changed)
  useEffect(() => {
    if (kind !== 'pistons') unregister('oversizeIn');
  }, [kind, unregister]);
  return (
    <>
      {kind === 'pistons' && (
        <NumberField
          name="oversizeIn"
          label="Oversize"
          unit="in"
          hint="How far over the standard bore the pistons are made: 0 for standard, 0.030 for +.030."
        />
      )}
      {(inspection === 'on_hold' || inspection === 'refused') && (
        <TextAreaField
          name="reason"
          label="Why"
          hint="What is wrong with the lot, for the builder who is refused it."
        />
      )}
    </>
  );
}

export function ReceiveLotPage() {
  const me = useSignedIn();
  const receive = useReceiveLot();
  const navigate = useNavigate();
  const suppliers = useSuppliers();
  if (!me) return null;
  const supplierOptions = (suppliers.data ?? []).map((s) => ({ value: String(s.id), label: s.name }));

  const onSubmit = async (body: ReceiveLotBody) => {
    const lot = await receive.mutateAsync(body);
    await navigate(receivedLotHref(lot.id), { state: { received: true } });
  };

  return (
    <div className="mx-auto max-w-[56rem]">
      <PageHeader
        title="Receive a lot"
        description="Log a lot of new parts as it arrives. A lot code is received once per supplier and part number."
        actions={<ButtonLink to={paths.receivedLots}>Purchased lots</ButtonLink>}
      />
      <Form
        schema={receiveLotBody}
        defaultValues={{
          receivedOn: today(),
          inspection: 'pending',
          reason: '',
          description: '',
          certificateAttachmentId: null,
        }}
        onSubmit={onSubmit}
      >
        <Card as="div">
          <CardHeader title="The lot" description="As printed on the supplier’s label and paperwork." />
          <CardBody>
            <div className="grid grid-cols-1 gap-4 md:grid-cols-2">
              <SelectField name="supplierId" label="Supplier" options={supplierOptions} placeholder="Choose…" numeric />
              <SelectField name="kind" label="Part" options={kindOptions} placeholder="Choose…" optional />
              <TextField name="partNumber" label="Part number" mono />
              <TextField name="lotCode" label="Lot code" mono />
              <NumberField name="quantity" label="Quantity received" integer hint="Parts, not boxes." />
              <TextField name="receivedOn" label="Received on" type="date" />
              <Conditional />
              <div className="md:col-span-2">
                <TextField
                  name="description"
                  label="Description"
                  optional
                  hint="Left empty, the part’s name is used."
                />
              </div>
            </div>
          </CardBody>
        </Card>
        <Card as="div">
          <CardHeader
            title="Certificate and inspection"
            description="Only an accepted lot can go into a unit. Hold or refuse one with the reason."
          />
          <CardBody>
            <div className="grid grid-cols-1 gap-4 md:grid-cols-2">
              <div className="md:col-span-2">
                <CertificateField name="certificateAttachmentId" />
              </div>
              <SelectField name="inspection" label="Inspection" options={inspectionOptions} />
            </div>
          </CardBody>
        </Card>
        <div>
          <SubmitButton size="lg">Receive lot</SubmitButton>
        </div>
      </Form>
    </div>
  );
}
