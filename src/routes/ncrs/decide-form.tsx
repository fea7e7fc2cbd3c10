import { useEffect } from 'react';
import { useFormContext, useWatch } from 'react-hook-form';
import { DISPOSITION_LABELS, DISPOSITIONS, dispositionBody } from '../../../shared/schemas/ncr';
import { useDecideNcr } from '../../api/ncrs/decide-ncr';
import type { Disposition, NcrDetail } from '../../api/ncrs/types';
import { RadioGroupField } from '../../components/choice-fields';
import { Form, SubmitButton } from '../../components/form';
import { SelectField, TextAreaField, TextField } from '../../components/form-fields';
import { Notice } from '../../components/ui/notice';
import { heldWords } from './ncr-words';
import { PASSWORD_HINT, SigningStatement } from '../../components/signing-statement';
import type { RunStep } from './signing';

const sendsBack = (d: Disposition | undefined) => d === 'rework' || d === 'repair';

/** A lot has no route to go back through; a part the plant remanufactures has no supplier to go back to. */
const dispositionsFor = (ncr: NcrDetail) =>
  DISPOSITIONS.filter((d) => (ncr.lot ? !sendsBack(d) : d !== 'return_to_supplier')).map((d) => ({
    value: d,
    label: DISPOSITION_LABELS[d],
  }));

function DecideFields({ ncr, signer }: { ncr: NcrDetail; signer: string }) {
  const disposition = useWatch({ name: 'disposition' }) as Disposition | undefined;
  const { setValue } = useFormContext();
  const back = sendsBack(disposition);
  // only rework and repair name a stage; the schema refuses a stage sent with anything else
  useEffect(() => {
    if (!back) setValue('reworkStage', undefined);
  }, [back, setValue]);
  const route = ncr.item?.route ?? [];
  const stageOptions = route.map((s) => ({ value: s.code, label: `${s.position}. ${s.name}` }));
  const twoSigners = ncr.severity === 'critical' && disposition === 'use_as_is';
  const meaning = disposition
    ? `${DISPOSITION_LABELS[disposition]}${twoSigners ? ' (first of two signatures)' : ''}`
    : 'the disposition you choose';

  return (
    <>
      <RadioGroupField
        name="disposition"
        legend="Disposition"
        options={dispositionsFor(ncr)}
        columns={2}
        hint={
          ncr.lot
            ? 'A purchased lot has no route, so it cannot be reworked or repaired. Any of these closes the NCR.'
            : 'Rework and repair send the part back to a stage of its route. Scrap ends it.'
        }
      />
      {back && (
        <SelectField
          name="reworkStage"
          label="Rework stage"
          options={stageOptions}
          placeholder="Choose the stage…"
          optional
          hint={
            ncr.stageName
              ? `It was found at ${ncr.stageName}: choose that stage or an earlier one. The part may then be recorded at the chosen stage only.`
              : 'The part may then be recorded at the chosen stage only.'
          }
        />
      )}
      {twoSigners && (
        <Notice tone="hold" title="Two signatures">
          This NCR is critical: using the {ncr.lot ? 'lot' : 'part'} as is needs a second quality engineer to
          countersign. Until then {heldWords(ncr)}.
        </Notice>
      )}
      <TextAreaField
        name="reason"
        label="Reason"
        hint="Why this disposition: the evidence, the reference, the limit."
      />
      <SigningStatement signer={signer} meaning={meaning} subject={ncr.number} />
      <TextField
        name="password"
        label="Password"
        type="password"
        autoComplete="current-password"
        hint={PASSWORD_HINT}
      />
    </>
  );
}

/** The disposition, signed: what happens to the part, why, and the decider's password. */
export function DecideForm({ ncr, signer, run }: { ncr: NcrDetail; signer: string; run: RunStep }) {
  const decide = useDecideNcr(ncr.number);
  return (
    <Form
      schema={dispositionBody}
      defaultValues={{ reason: '', password: '' }}
      onSubmit={(body) => run(() => decide.mutateAsync(body))}
    >
      <DecideFields ncr={ncr} signer={signer} />
      <div className="flex justify-end">
        <SubmitButton>Sign decision</SubmitButton>
      </div>
    </Form>
  );
}
