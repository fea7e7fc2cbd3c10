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
import { useT } from '../../lib/i18n';
import { label } from '../../lib/server-messages';

const completeOptions = (t: ReturnType<typeof useT>) => [
  { value: true, label: t('receive.complete') },
  { value: false, label: t('receive.partsMissing') },
];
const decisionOptions = (t: ReturnType<typeof useT>) => [
  { value: true, label: t('receive.accept') },
  { value: false, label: t('receive.reject') },
];
const missingOptions = () => CORE_PARTS.map((p) => ({ value: p, label: label(CORE_PART_LABELS[p]) }));
const damageOptions = () => DAMAGE.map((d) => ({ value: d, label: label(DAMAGE_LABELS[d]) }));
const gradeOptions = () => GRADES.map((g) => ({ value: g, label: label(GRADE_LABELS[g]) }));

export function ConditionFields() {
  const t = useT();
  const { setValue } = useFormContext<ReceiveCoreBody>();
  const complete = useWatch<ReceiveCoreBody, 'complete'>({ name: 'complete' });
  useEffect(() => {
    if (complete) setValue('missing', []);
  }, [complete, setValue]);
  return (
    <div className="flex flex-col gap-4">
      <RadioGroupField name="complete" legend={t('receive.arrived')} options={completeOptions(t)} />
      {complete === false && (
        <CheckboxListField name="missing" legend={t('receive.missingParts')} options={missingOptions()} columns={4} />
      )}
      <CheckboxListField
        name="damage"
        legend={t('receive.damage')}
        options={damageOptions()}
        columns={3}
        hint={t('receive.damageHint')}
      />
      <SelectField
        name="grade"
        label={t('receive.grade')}
        options={gradeOptions()}
        placeholder={t('receive.chooseGrade')}
        optional
      />
    </div>
  );
}

export function DecisionFields() {
  const t = useT();
  const { setValue } = useFormContext<ReceiveCoreBody>();
  const accepted = useWatch<ReceiveCoreBody, 'accepted'>({ name: 'accepted' });
  useEffect(() => {
    if (accepted) setValue('rejectReason', undefined);
  }, [accepted, setValue]);
  return (
    <div className="flex flex-col gap-4">
      <RadioGroupField
        name="accepted"
        legend={t('receive.acceptOrReject')}
        options={decisionOptions(t)}
        hint={t('receive.decisionHint')}
      />
      {accepted === false && <TextAreaField name="rejectReason" label={t('receive.rejectReason')} optional />}
    </div>
  );
}
