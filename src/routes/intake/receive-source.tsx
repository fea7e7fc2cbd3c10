import { useEffect } from 'react';
import { useFormContext, useWatch } from 'react-hook-form';
import { CREDIT_DECISIONS, SOURCES, type ReceiveCoreBody } from '../../../shared/schemas/intake';
import { useCustomers } from '../../api/reference/customers';
import { useSuppliers } from '../../api/reference/suppliers';
import { SelectField, TextAreaField, TextField } from '../../components/form-fields';
import { CREDIT_LABELS, SOURCE_LABELS } from '../../lib/intake-labels';

const sourceOptions = SOURCES.map((s) => ({ value: s, label: SOURCE_LABELS[s] }));
const creditOptions = CREDIT_DECISIONS.map((c) => ({ value: c, label: CREDIT_LABELS[c] }));

/** Fields of the other source are emptied when the source changes, since the schema refuses them. */
function useSourceSync() {
  const { setValue } = useFormContext<ReceiveCoreBody>();
  const [source, credit] = useWatch<ReceiveCoreBody, ['source', 'creditDecision']>({
    name: ['source', 'creditDecision'],
  });
  useEffect(() => {
    if (source !== 'customer_return') {
      setValue('customerId', undefined);
      setValue('creditDecision', undefined);
      setValue('creditReason', undefined);
    }
    if (source !== 'purchased') setValue('supplierId', undefined);
  }, [source, setValue]);
  useEffect(() => {
    if (credit === 'full') setValue('creditReason', undefined);
  }, [credit, setValue]);
  return { source, credit };
}

export function SourceFields() {
  const { source, credit } = useSourceSync();
  const customers = useCustomers();
  const suppliers = useSuppliers();
  const party = (rows: { id: number; code: string; name: string }[] | undefined) =>
    (rows ?? []).map((p) => ({ value: String(p.id), label: `${p.name} (${p.code})` }));

  return (
    <div className="grid grid-cols-1 gap-4 md:grid-cols-2">
      <SelectField name="source" label="Source" options={sourceOptions} placeholder="Choose…" optional />
      {source === 'customer_return' && (
        <>
          <SelectField
            name="customerId"
            label="Customer"
            options={party(customers.data)}
            placeholder="Choose the customer…"
            numeric
          />
          <TextField name="sourceReference" label="Return reference" mono hint="As on the return paperwork." />
          <SelectField
            name="creditDecision"
            label="Core credit"
            options={creditOptions}
            placeholder="Decide…"
            optional
            hint="What the customer is credited for this core."
          />
          {credit && credit !== 'full' && (
            <div className="md:col-span-2">
              <TextAreaField
                name="creditReason"
                label="Credit reason"
                hint="Why the credit is partial or none; the customer may ask."
                optional
              />
            </div>
          )}
        </>
      )}
      {source === 'purchased' && (
        <>
          <SelectField
            name="supplierId"
            label="Supplier"
            options={party(suppliers.data)}
            placeholder="Choose the supplier…"
            numeric
          />
          <TextField name="sourceReference" label="Purchase reference" mono hint="Purchase order or invoice." />
        </>
      )}
    </div>
  );
}
