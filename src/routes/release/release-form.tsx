import { RELEASE_MEANING, releaseBody, type ReleaseBody } from '../../../shared/schemas/release';
import { useSignedIn } from '../../api/auth/me';
import { usePlant } from '../../api/plant/plant';
import { useCustomers } from '../../api/reference/customers';
import { useReleaseUnit, type ReleaseReply } from '../../api/release/release-unit';
import { Form, SubmitButton } from '../../components/form';
import { SelectField, TextField } from '../../components/form-fields';
import { PASSWORD_HINT, SigningStatement } from '../../components/signing-statement';

/**
 * The shipment, signed: the gate is checked again on the server, under the unit's lock, when this
 * is sent. The ship date is a day of the plant's calendar (its time zone, from the server), never
 * after today there.
 */
export function ReleaseForm({ serial, onShipped }: { serial: string; onShipped: (reply: ReleaseReply) => void }) {
  const customers = useCustomers();
  const plant = usePlant();
  const me = useSignedIn();
  const release = useReleaseUnit();
  const options = (customers.data ?? []).map((c) => ({ value: String(c.id), label: `${c.name} (${c.code})` }));
  const onSubmit = async (body: ReleaseBody) => onShipped(await release.mutateAsync({ serial, body }));
  if (!plant.data) return <p className="text-ink-soft">Reading the plant’s calendar…</p>;
  return (
    <Form
      schema={releaseBody}
      defaultValues={{ reference: '', shipDate: plant.data.today, carrier: '', password: '' }}
      onSubmit={onSubmit}
    >
      <div className="grid grid-cols-1 gap-4 md:grid-cols-2">
        <SelectField name="customerId" label="Customer" options={options} placeholder="Choose…" numeric />
        <TextField
          name="reference"
          label="Order reference"
          mono
          hint="The customer's order or the plant's sales order."
        />
        <TextField
          name="shipDate"
          label="Ship date"
          type="date"
          max={plant.data.today}
          hint={`The warranty starts on this day. Not after today (${plant.data.today} at the plant).`}
        />
        <TextField name="carrier" label="Carrier" hint="Who takes it, if known." />
      </div>
      <SigningStatement signer={me?.user.name ?? 'you'} meaning={RELEASE_MEANING.toLowerCase()} subject={serial} />
      <div className="max-w-sm">
        <TextField
          name="password"
          label="Password"
          type="password"
          autoComplete="current-password"
          hint={PASSWORD_HINT}
        />
      </div>
      <div className="flex justify-end">
        <SubmitButton size="lg">Sign, release and ship</SubmitButton>
      </div>
    </Form>
  );
}
