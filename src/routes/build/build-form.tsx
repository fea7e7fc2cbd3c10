import { useId, useState, type ReactNode } from 'react';
import { useFormContext, useFormState, useWatch } from 'react-hook-form';
import { buildBody, LOT_KINDS, SIZED_LOT_KINDS, type BuildBody } from '../../../shared/schemas/build';
import type { EngineFamily } from '../../../shared/schemas/reference';
import type { ItemJson } from '../../api/items/types';
import { useFamilies } from '../../api/reference/families';
import { useBuildUnit } from '../../api/build/build-unit';
import { Caution } from '../../components/caution';
import { Form, SubmitButton } from '../../components/form';
import { TextAreaField } from '../../components/form-fields';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { describedBy, Field } from '../../components/ui/field';
import { Select } from '../../components/ui/select';
import { ApiError } from '../../lib/http';
import { t, useT } from '../../lib/i18n';
import { LotRows } from './lot-rows';
import { PartSlot } from './part-slot';
import { RefusalProvider, RefusalSummary, type Refusal } from './refusals';
import { localizeText } from '../../lib/server-messages';
import { slotsFor } from './slots';
import { useChosenFamily } from './use-family';

/** Parts of one form, so not landmarks of their own. */
function Section({ title, description, children }: { title: string; description?: ReactNode; children: ReactNode }) {
  return (
    <Card as="div">
      <CardHeader title={title} description={description} />
      <CardBody>{children}</CardBody>
    </Card>
  );
}

const layoutWords = (f: EngineFamily) =>
  t(f.layout === 'v' ? 'build.layoutV' : 'build.layoutInline', { cylinders: f.cylinders });

function FamilyField({ onChange }: { onChange: () => void }) {
  const id = useId();
  useT();
  const families = useFamilies();
  const { register, setValue, formState } = useFormContext<BuildBody>();
  const family = useChosenFamily();
  const raw = formState.errors.family?.message;
  const error = raw && localizeText(raw);
  const hint = family ? layoutWords(family) : t('build.familyHint');
  const options = (families.data ?? [])
    .filter((f) => f.active)
    .map((f) => ({ value: f.code, label: `${f.code} — ${f.name}` }));
  return (
    <div className="max-w-xl">
      <Field id={id} label={t('build.family')} hint={hint} error={error}>
        <Select
          id={id}
          options={options}
          placeholder={t('common.choose')}
          aria-invalid={error ? true : undefined}
          aria-describedby={describedBy(id, hint, error)}
          {...register('family', {
            onChange: (e: { target: { value: string } }) => {
              const next = families.data?.find((f) => f.code === e.target.value);
              // a V takes a left and a right head, an inline engine one; pistons and ring sets go one per cylinder
              setValue(
                'heads',
                Array.from({ length: next?.headsPerEngine ?? 1 }, () => ''),
              );
              if (next) {
                setValue(`lots.${LOT_KINDS.indexOf('pistons')}.quantity`, next.cylinders);
                setValue(`lots.${LOT_KINDS.indexOf('rings')}.quantity`, next.cylinders);
              }
              onChange();
            },
          })}
        />
      </Field>
    </div>
  );
}

function PartSlots() {
  useT();
  const family = useChosenFamily();
  const values = useWatch({ name: ['block', 'crankshaft', 'heads'] }) as [string, string, string[] | undefined];
  const { errors } = useFormState<BuildBody>();
  if (!family) {
    return <p className="text-ink-soft">{t('build.familyFirst')}</p>;
  }
  const slots = slotsFor(family);
  const serialOf = (name: string) =>
    name === 'block' ? values[0] : name === 'crankshaft' ? values[1] : (values[2]?.[Number(name.split('.')[1])] ?? '');
  const pairRaw = errors.heads?.message ?? errors.heads?.root?.message;
  const pairError = pairRaw && localizeText(pairRaw);
  return (
    <div className="grid grid-cols-1 gap-x-8 gap-y-6 xl:grid-cols-2">
      {slots.map((s) => {
        const serial = serialOf(s.name);
        const twin = serial ? slots.find((o) => o.name !== s.name && serialOf(o.name) === serial) : undefined;
        return (
          <PartSlot
            key={`${family.code}/${s.name}`}
            slot={s}
            familyCode={family.code}
            elsewhere={twin?.label ?? null}
          />
        );
      })}
      {pairError && <p className="font-medium text-bad xl:col-span-2">{pairError}</p>}
    </div>
  );
}

function Summary() {
  const family = useChosenFamily();
  return <RefusalSummary slots={slotsFor(family)} />;
}

const emptyLots = () =>
  LOT_KINDS.map((kind) => ({
    kind,
    supplierId: undefined,
    partNumber: '',
    lotCode: '',
    quantity: 1,
    ...(kind === 'pistons' ? { oversizeIn: undefined } : {}),
    ...(SIZED_LOT_KINDS.includes(kind) ? { sizeClass: '' } : {}),
  }));

/**
 * The build sheet: family, the manufactured parts by serial, the purchased lots. The server
 * checks every part and lot and answers with every refusal at once; each is shown at its slot or
 * row and in the list above the button.
 */
export function BuildForm({ onBuilt }: { onBuilt: (unit: ItemJson, body: BuildBody) => void }) {
  const build = useBuildUnit();
  useT();
  const [refusal, setRefusal] = useState<Refusal | null>(null);

  const clear = (match: (key: string) => boolean) =>
    setRefusal((r) => {
      if (!r) return r;
      const fields = Object.fromEntries(Object.entries(r.fields).filter(([k]) => !match(k)));
      return Object.keys(fields).length ? { ...r, fields } : null;
    });

  const onSubmit = async (body: BuildBody) => {
    setRefusal(null);
    try {
      onBuilt(await build.mutateAsync(body), body);
    } catch (err) {
      if (err instanceof ApiError && Object.keys(err.fields).length > 0) {
        setRefusal({
          title: err.code === 'build_refused' ? t('build.notStarted') : err.message,
          fields: err.fields,
        });
        return;
      }
      throw err;
    }
  };

  return (
    <RefusalProvider value={{ refusal, clear }}>
      <Form
        schema={buildBody}
        defaultValues={{ family: '', block: '', crankshaft: '', heads: [''], lots: emptyLots(), notes: '' }}
        onSubmit={onSubmit}
      >
        <Section title={t('build.familyParts')} description={t('build.familyPartsIntro')}>
          <div className="flex flex-col gap-5">
            <FamilyField onChange={() => setRefusal(null)} />
            <Caution title={t('build.heavyTitle')} icon="hoist">
              {t('build.heavyBody')}
            </Caution>
            <PartSlots />
          </div>
        </Section>
        <Section title={t('build.lots')} description={t('build.lotsIntro')}>
          <LotRows />
        </Section>
        <Section title={t('form.notes')}>
          <TextAreaField name="notes" label={t('build.notes')} hint={t('build.notesHint')} />
        </Section>
        <Summary />
        <div className="flex justify-end">
          <SubmitButton size="lg">{t('build.submit')}</SubmitButton>
        </div>
      </Form>
    </RefusalProvider>
  );
}
