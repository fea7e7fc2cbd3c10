import { releaseBody, type ReleaseBody } from '../../../shared/schemas/build';
import { useCustomers } from '../../api/reference/customers';
import { useReleaseUnit, type ReleaseReply } from '../../api/units/release-unit';
import { Form, SubmitButton } from '../../components/form';
import { SelectField, TextField } from '../../components/form-fields';

/** Today on the dock's own calendar, not UTC's. */
function today(): string {
  const d = new Date();
  const pad = (n: number) => String(n).padStart(2, '0');
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}`;
}

/** The shipment: the gate is checked again on the server, under the unit's lock, when this is sent. */
export function ReleaseForm({ serial, onShipped }: { serial: string; onShipped: (reply: ReleaseReply) => void }) {
  const customers = useCustomers();
  const release = useReleaseUnit();
  const options = (customers.data ?? []).map((c) => ({ value: String(c.id), label: `${c.name} (${c.code})` }));
  const onSubmit = async (body: ReleaseBody) => onShipped(await release.mutateAsync({ serial, body }));
  return (
    <Form schema={releaseBody} defaultValues={{ reference: '', shipDate: today(), carrier: '' }} onSubmit={onSubmit}>
      <div className="grid grid-cols-1 gap-4 md:grid-cols-2">
        <SelectField name="customerId" label="Customer" options={options} placeholder="Choose…" numeric />
        <TextField
          name="reference"
          label="Order reference"
          mono
          hint="The customer's order or the plant's sales order."
        />
        <TextField name="shipDate" label="Ship date" type="date" hint="The warranty starts on this day." />
        <TextField name="carrier" label="Carrier" hint="Who takes it, if known." />
      </div>
      <div className="flex justify-end">
        <SubmitButton size="lg">Release and ship</SubmitButton>
      </div>
    </Form>
  );
}
