import { useEffect } from 'react';
import { useFormContext, useWatch } from 'react-hook-form';
import { CREDIT_DECISIONS, SOURCES, type ReceiveCoreBody } from '../../../shared/schemas/intake';
import { useCustomers } from '../../api/reference/customers';
import { useSuppliers } from '../../api/reference/suppliers';
import { SelectField, TextAreaField, TextField } from '../../components/form-fields';
import { useT } from '../../lib/i18n';
import { CREDIT_LABELS, SOURCE_LABELS } from '../../lib/intake-labels';
import { label } from '../../lib/server-messages';

const sourceOptions = () => SOURCES.map((s) => ({ value: s, label: label(SOURCE_LABELS[s]) }));
const creditOptions = () => CREDIT_DECISIONS.map((c) => ({ value: c, label: label(CREDIT_LABELS[c]) }));

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
  const t = useT();
  const { source, credit } = useSourceSync();
  const customers = useCustomers();
  const suppliers = useSuppliers();
  const party = (rows: { id: number; code: string; name: string }[] | undefined) =>
    (rows ?? []).map((p) => ({ value: String(p.id), label: `${p.name} (${p.code})` }));

  return (
    <div className="grid grid-cols-1 gap-4 md:grid-cols-2">
      <SelectField
        name="source"
        label={t('receive.sourceLabel')}
        options={sourceOptions()}
        placeholder={t('common.choose')}
        optional
      />
      {source === 'customer_return' && (
        <>
          <SelectField
            name="customerId"
            label={t('receive.customer')}
            options={party(customers.data)}
            placeholder={t('receive.chooseCustomer')}
            numeric
          />
          <TextField name="sourceReference" label={t('receive.returnRef')} mono hint={t('receive.returnRefHint')} />
          <SelectField
            name="creditDecision"
            label={t('receive.credit')}
            options={creditOptions()}
            placeholder={t('receive.decide')}
            optional
            hint={t('receive.creditHint')}
          />
          {credit && credit !== 'full' && (
            <div className="md:col-span-2">
              <TextAreaField
                name="creditReason"
                label={t('receive.creditReason')}
                hint={t('receive.creditReasonHint')}
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
            label={t('receive.supplier')}
            options={party(suppliers.data)}
            placeholder={t('receive.chooseSupplier')}
            numeric
          />
          <TextField name="sourceReference" label={t('receive.purchaseRef')} mono hint={t('receive.purchaseRefHint')} />
        </>
      )}
    </div>
  );
}
