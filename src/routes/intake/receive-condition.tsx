import { useEffect } from 'react';
import { useFormContext, useWatch } from 'react-hook-form';
import {
  CORE_PART_LABELS,
  CORE_PARTS,
  DAMAGE,
  DAMAGE_LABELS,
  GRADE_LABELS,
  GRADES,
  type ReceiveCoreBody,
} from '../../../shared/schemas/intake';
import { CheckboxListField, RadioGroupField } from '../../components/choice-fields';
import { SelectField, TextAreaField } from '../../components/form-fields';

const completeOptions = [
  { value: true, label: 'Complete' },
  { value: false, label: 'Parts missing' },
];
const decisionOptions = [
  { value: true, label: 'Accept' },
  { value: false, label: 'Reject' },
];
const missingOptions = CORE_PARTS.map((p) => ({ value: p, label: CORE_PART_LABELS[p] }));
const damageOptions = DAMAGE.map((d) => ({ value: d, label: DAMAGE_LABELS[d] }));
const gradeOptions = GRADES.map((g) => ({ value: g, label: GRADE_LABELS[g] }));

export function ConditionFields() {
  const { setValue } = useFormContext<ReceiveCoreBody>();
  const complete = useWatch<ReceiveCoreBody, 'complete'>({ name: 'complete' });
  useEffect(() => {
    if (complete) setValue('missing', []);
  }, [complete, setValue]);
  return (
    <div className="flex flex-col gap-4">
      <RadioGroupField name="complete" legend="Arrived" options={completeOptions} />
      {complete === false && (
        <CheckboxListField name="missing" legend="Missing parts" options={missingOptions} columns={4} />
      )}
      <CheckboxListField
        name="damage"
        legend="Damage seen"
        options={damageOptions}
        columns={3}
        hint="Leave all unticked when there is none."
      />
      <SelectField name="grade" label="Grade" options={gradeOptions} placeholder="Choose a grade…" optional />
    </div>
  );
}

export function DecisionFields() {
  const { setValue } = useFormContext<ReceiveCoreBody>();
  const accepted = useWatch<ReceiveCoreBody, 'accepted'>({ name: 'accepted' });
  useEffect(() => {
    if (accepted) setValue('rejectReason', undefined);
  }, [accepted, setValue]);
  return (
    <div className="flex flex-col gap-4">
      <RadioGroupField
        name="accepted"
        legend="Accept or reject"
        options={decisionOptions}
        hint="A rejected core is kept on record with its reason and photos."
      />
      {accepted === false && <TextAreaField name="rejectReason" label="Reject reason" optional />}
    </div>
  );
}
