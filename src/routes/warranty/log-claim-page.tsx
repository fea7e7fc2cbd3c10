import type { QueryClient } from '@tanstack/react-query';
import { useWatch } from 'react-hook-form';
import { useNavigate, useSearchParams, type LoaderFunctionArgs } from 'react-router';
import { logClaimBody, type LogClaimBody } from '../../../shared/schemas/warranty';
import { useSignedIn } from '../../api/auth/me';
import { plantQueryOptions, usePlant } from '../../api/plant/plant';
import { customersQueryOptions, useCustomers } from '../../api/reference/customers';
import { useLogClaim } from '../../api/warranty/log-claim';
import { Form } from '../../components/form';
import { NumberField, SelectField, TextAreaField, TextField } from '../../components/form-fields';
import { PageHeader } from '../../components/page-header';
import { SignStep } from '../../components/sign-dialog';
import { Card, CardBody } from '../../components/ui/card';
import { claimHref } from '../../lib/paths';
import { requirePermission } from '../../lib/session';
import { CoveragePanel } from './coverage-panel';

export const logClaimLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'warranty.record');
    await Promise.all([
      queryClient.ensureQueryData(customersQueryOptions()),
      queryClient.ensureQueryData(plantQueryOptions()),
    ]);
    return null;
  };

function LogSign({ signer }: { signer: string }) {
  const serial = (useWatch({ name: 'serial' }) as string | undefined)?.trim().toUpperCase();
  return (
    <SignStep
      label="Sign and log the claim"
      signer={signer}
      meaning="log a warranty claim"
      subject={serial || 'the unit above'}
    >
      The coverage shown above is kept with the claim as it was said; receiving is told to expect the unit back.
    </SignStep>
  );
}

/** The desk logs a claim by serial; coverage shows as the form is filled, and the claim is signed. */
export function LogClaimPage() {
  const me = useSignedIn();
  const plant = usePlant();
  const customers = useCustomers();
  const log = useLogClaim();
  const navigate = useNavigate();
  const [params] = useSearchParams();
  if (!me || !plant.data) return null;
  const options = (customers.data ?? []).map((c) => ({ value: String(c.id), label: `${c.name} (${c.code})` }));
  const defaults: Partial<LogClaimBody> = {
    serial: params.get('serial') ?? '',
    customerReference: '',
    failedOn: plant.data.today,
    distanceKm: null,
    hours: null,
    symptom: '',
    installer: '',
    password: '',
  };
  return (
    <div className="mx-auto max-w-4xl">
      <PageHeader
        title="Log a claim"
        description="A customer reports a failure of a unit we shipped. Coverage is worked out from the unit’s own shipment: months from the ship date and the distance limit, whichever comes first."
      />
      <Card as="div">
        <CardBody>
          <Form
            schema={logClaimBody}
            defaultValues={defaults}
            onSubmit={async (body) => {
              const claim = await log.mutateAsync(body);
              await navigate(claimHref(claim.number), { state: { logged: true } });
            }}
          >
            <div className="grid grid-cols-1 gap-4 md:grid-cols-2">
              <TextField
                name="serial"
                label="Unit serial"
                mono
                autoFocus
                hint="The long block’s label, scanned or typed."
              />
              <TextField
                name="failedOn"
                label="Failed on"
                type="date"
                max={plant.data.today}
                hint="The day the customer says it failed."
              />
              <NumberField
                name="distanceKm"
                label="Distance run"
                unit="km"
                integer
                nullable
                hint="From the odometer."
              />
              <NumberField name="hours" label="Hours run" nullable hint="From the hour meter, where there is one." />
            </div>
            <CoveragePanel />
            <div className="grid grid-cols-1 gap-4 md:grid-cols-2">
              <SelectField name="customerId" label="Customer" options={options} placeholder="Choose…" numeric />
              <TextField
                name="customerReference"
                label="Customer’s reference"
                mono
                hint="Their claim or RMA number, if any."
              />
            </div>
            <TextAreaField
              name="symptom"
              label="What the customer reports"
              hint="In their words: what happened, when, under what load."
            />
            <TextField name="installer" label="Installed by" hint="The garage or fitter who installed the unit." />
            <LogSign signer={me.user.name} />
          </Form>
        </CardBody>
      </Card>
    </div>
  );
}
