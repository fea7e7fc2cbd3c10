import type { QueryClient } from '@tanstack/react-query';
import { useState, type ReactNode } from 'react';
import { useNavigate, type LoaderFunctionArgs } from 'react-router';
import { receiveCoreBody, type ReceiveCoreBody } from '../../../shared/schemas/intake';
import { useSignedIn } from '../../api/auth/me';
import { useReceiveCore } from '../../api/cores/receive-core';
import type { Duplicate } from '../../api/cores/types';
import { customersQueryOptions } from '../../api/reference/customers';
import { familiesQueryOptions, useFamilies } from '../../api/reference/families';
import { suppliersQueryOptions } from '../../api/reference/suppliers';
import { Form, SubmitButton } from '../../components/form';
import { SelectField, TextAreaField, TextField } from '../../components/form-fields';
import { FormSummary, type SummarySection } from '../../components/form-summary';
import { PageHeader } from '../../components/page-header';
import { PhotoField } from '../../components/photo-field';
import { ButtonLink } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { ApiError } from '../../lib/http';
import { useT } from '../../lib/i18n';
import { coreHref, paths } from '../../lib/paths';
import { requirePermission } from '../../lib/session';
import { DuplicateConfirm, useDuplicateWarning } from './duplicates';
import { MismatchCheck } from './mismatches';
import { ConditionFields, DecisionFields } from './receive-condition';
import { SourceFields } from './receive-source';
import { intakeWords } from './screen-words';

export const receiveLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'intake.record');
    await Promise.all([
      queryClient.ensureQueryData(familiesQueryOptions()),
      queryClient.ensureQueryData(customersQueryOptions()),
      queryClient.ensureQueryData(suppliersQueryOptions()),
      intakeWords(),
    ]);
    return null;
  };

/** Today on the dock's own calendar, not UTC's. */
function today(): string {
  const d = new Date();
  const pad = (n: number) => String(n).padStart(2, '0');
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}`;
}

/** Parts of one form, so not landmarks of their own (and their titles never shadow a field's label). */
function Section({
  id,
  title,
  description,
  children,
}: {
  id: string;
  title: string;
  description?: string;
  children: ReactNode;
}) {
  return (
    <div id={id} className="scroll-mt-4">
      <Card as="div">
        <CardHeader title={title} description={description} />
        <CardBody>{children}</CardBody>
      </Card>
    </div>
  );
}

const SECTIONS: { id: string; title: string; fields: string[] }[] = [
  { id: 'receive-core', title: 'receive.core', fields: ['familyId', 'castingNumber', 'idNumber'] },
  {
    id: 'receive-source',
    title: 'receive.source',
    fields: ['source', 'customerId', 'supplierId', 'sourceReference'],
  },
  { id: 'receive-receipt', title: 'receive.receipt', fields: ['receivedOn'] },
  { id: 'receive-condition', title: 'receive.condition', fields: ['complete', 'missing', 'damage', 'grade'] },
  {
    id: 'receive-decision',
    title: 'receive.decision',
    fields: ['accepted', 'rejectReason', 'creditDecision', 'creditReason', 'mismatchReason'],
  },
  { id: 'receive-photos', title: 'receive.photosNotes', fields: ['photoIds', 'notes'] },
];

// a field's name as the list of what is missing says it (receive.field.<name> in the locale files)
const FIELDS = [
  'familyId',
  'castingNumber',
  'idNumber',
  'source',
  'customerId',
  'supplierId',
  'sourceReference',
  'receivedOn',
  'complete',
  'missing',
  'damage',
  'grade',
  'accepted',
  'rejectReason',
  'creditDecision',
  'creditReason',
  'mismatchReason',
  'photoIds',
  'notes',
];

function CoreNumbers() {
  const t = useT();
  const families = useFamilies();
  const { onLeave, warning } = useDuplicateWarning();
  const options = (families.data ?? [])
    .filter((f) => f.active)
    .map((f) => ({ value: String(f.id), label: `${f.code} — ${f.name}` }));
  return (
    <div className="flex flex-col gap-4">
      <SelectField
        name="familyId"
        label={t('receive.family')}
        options={options}
        placeholder={t('common.choose')}
        numeric
      />
      {/* leaving either number field (focus moving out) asks about look-alikes */}
      <div className="grid grid-cols-1 gap-4 md:grid-cols-2" onBlur={onLeave}>
        <TextField name="castingNumber" label={t('receive.casting')} mono hint={t('receive.castingHint')} />
        <TextField name="idNumber" label={t('receive.idNumber')} mono optional hint={t('receive.idNumberHint')} />
      </div>
      {warning}
    </div>
  );
}

// most cores come back from customers, whole: those two start chosen; the decisions do not
const defaults: Partial<ReceiveCoreBody> = {
  source: 'customer_return',
  complete: true,
  castingNumber: '',
  sourceReference: '',
  missing: [],
  damage: [],
  notes: '',
  photoIds: [],
  confirmNotDuplicate: false,
};

export function ReceivePage() {
  const me = useSignedIn();
  const receive = useReceiveCore();
  const navigate = useNavigate();
  const [lookAlikes, setLookAlikes] = useState<Duplicate[] | null>(null);
  const [mismatches, setMismatches] = useState<string[]>([]);
  const t = useT();
  if (!me) return null;
  const sections: SummarySection[] = SECTIONS.map((s) => ({ ...s, title: t(s.title) }));
  const labels = Object.fromEntries(FIELDS.map((f) => [f, t(`receive.field.${f}`)]));

  const onSubmit = async (body: ReceiveCoreBody) => {
    try {
      const core = await receive.mutateAsync(body);
      await navigate(coreHref(core.serial), { state: { received: true } });
    } catch (err) {
      if (err instanceof ApiError && err.status === 409 && err.details.reason === 'possible_duplicate') {
        setLookAlikes((err.details.duplicates as Duplicate[] | undefined) ?? []);
      }
      if (err instanceof ApiError && err.status === 409 && err.details.reason === 'needs_reason') {
        setMismatches((err.details.mismatches as string[] | undefined) ?? []);
      }
      throw err;
    }
  };

  return (
    <div className="mx-auto max-w-[80rem]">
      <PageHeader
        title={t('receive.title')}
        description={t('receive.intro')}
        actions={<ButtonLink to={paths.intake}>{t('receive.log')}</ButtonLink>}
      />
      <Form schema={receiveCoreBody} defaultValues={{ ...defaults, receivedOn: today() }} onSubmit={onSubmit}>
        <div className="grid grid-cols-1 gap-4 lg:grid-cols-[minmax(0,1fr)_17rem]">
          <div className="flex min-w-0 flex-col gap-4">
            <Section id="receive-core" title={t('receive.core')} description={t('receive.coreIntro')}>
              <CoreNumbers />
            </Section>
            <Section id="receive-source" title={t('receive.source')}>
              <SourceFields />
            </Section>
            <Section id="receive-receipt" title={t('receive.receipt')}>
              <div className="grid grid-cols-1 gap-4 md:grid-cols-2">
                <TextField name="receivedOn" label={t('receive.receivedOn')} type="date" />
                {/* who received it is not a choice: shown as text, not as a box that looks editable */}
                <div className="flex flex-col gap-1.5">
                  <p className="text-sm font-medium text-ink floor:text-base">{t('receive.receivedBy')}</p>
                  <p className="flex min-h-9 items-center font-medium floor:min-h-12">{me.user.name}</p>
                  <p className="text-sm text-ink-faint">{t('receive.you')}</p>
                </div>
              </div>
            </Section>
            <Section id="receive-condition" title={t('receive.condition')} description={t('receive.conditionIntro')}>
              <ConditionFields />
            </Section>
            <Section id="receive-decision" title={t('receive.decision')}>
              <DecisionFields />
            </Section>
            <Section id="receive-photos" title={t('receive.photosNotes')}>
              <div className="flex flex-col gap-4">
                <PhotoField name="photoIds" label={t('form.photos')} max={12} />
                <TextAreaField name="notes" label={t('form.notes')} hint={t('receive.notesHint')} />
              </div>
            </Section>
            <MismatchCheck fromServer={mismatches} />
            {lookAlikes && lookAlikes.length > 0 && <DuplicateConfirm rows={lookAlikes} />}
          </div>
          <FormSummary schema={receiveCoreBody} sections={sections} labels={labels}>
            <SubmitButton size="lg">{t('receive.submit')}</SubmitButton>
          </FormSummary>
        </div>
      </Form>
    </div>
  );
}
