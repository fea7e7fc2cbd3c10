import { useMemo } from 'react';
import { useController, useFormContext } from 'react-hook-form';
import { CORE_PART_LABELS, DAMAGE_LABELS, WEAR_PARTS, type CoreReceipt } from '../../../shared/schemas/intake';
import { useTearDownCore } from '../../api/cores/tear-down-core';
import type { CoreDetail } from '../../api/cores/types';
import type { ItemJson } from '../../api/items/types';
import { Caution } from '../../components/caution';
import { Form, SubmitButton } from '../../components/form';
import { TextAreaField, TextField } from '../../components/form-fields';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Icon, type IconName } from '../../components/ui/icon';
import { Notice } from '../../components/ui/notice';
import { missingAtIntake, rowsFor, teardownForm, type Decision, type PartRow } from './teardown-schema';
import { t } from '../../lib/i18n';
import { localizeHazard, localizeText, label, partLabel } from '../../lib/server-messages';

// a chosen tile is filled (white on the state colour), so it stands out in sunlight and in grey
const TILE: Record<Decision, { word: string; icon: IconName; checked: string }> = {
  keep: {
    word: 'teardown.keep',
    icon: 'ok',
    checked: 'has-checked:border-ok has-checked:bg-ok has-checked:text-white',
  },
  scrap: {
    word: 'teardown.scrap',
    icon: 'bad',
    checked: 'has-checked:border-bad has-checked:bg-bad has-checked:text-white',
  },
  absent: {
    word: 'teardown.notThere',
    icon: 'off',
    checked: 'has-checked:border-dashed has-checked:border-ink has-checked:bg-ink-soft has-checked:text-white',
  },
};

type FormValues = { parts: { decision?: Decision; reason?: string }[]; notes: string };

/** One major part: Keep, Scrap (with a reason) or not there / not tracked, as three large tiles. */
function PartDecision({ row, index, missing }: { row: PartRow; index: number; missing: boolean }) {
  const {
    field: { ref, value, onChange, onBlur },
  } = useController<FormValues, `parts.${number}.decision`>({ name: `parts.${index}.decision` });
  const { formState } = useFormContext<FormValues>();
  const raw = formState.errors.parts?.[index]?.decision?.message;
  const error = raw && localizeText(raw);
  const name = partLabel(row.label);
  const absentWord = row.optional ? 'teardown.notTracked' : 'teardown.notThere';
  const errorId = `part-${index}-error`;
  const labelId = `part-${index}-label`;
  return (
    <li className="flex flex-col gap-3 py-4 first:pt-0 last:pb-0">
      <div
        role="radiogroup"
        aria-labelledby={labelId}
        aria-describedby={error ? errorId : undefined}
        className="flex flex-wrap items-center justify-between gap-3"
      >
        <p id={labelId} className="text-xl font-semibold">
          {name}
          {row.optional && (
            <span className="ml-2 text-base font-normal text-ink-soft">{t('teardown.whereTracked')}</span>
          )}
          {missing && (
            <span className="mt-1 flex items-center gap-1.5 text-base font-medium text-ink-soft">
              <Icon name="off" size={18} />
              {t('teardown.missingAtIntake')}
            </span>
          )}
        </p>
        <div className="grid w-full grid-cols-3 gap-2 sm:w-auto sm:grid-cols-[repeat(3,10.5rem)]">
          {(['keep', 'scrap', 'absent'] as const).map((d, i) => {
            const word = t(d === 'absent' ? absentWord : TILE[d].word);
            return (
              <label
                key={d}
                className={`relative flex min-h-14 cursor-pointer whitespace-nowrap items-center justify-center gap-2 rounded-control border-2 border-rule-strong bg-field px-4 text-lg font-semibold text-ink hover:border-ink-soft has-focus-visible:outline-3 has-focus-visible:outline-offset-2 has-focus-visible:outline-accent ${TILE[d].checked}`}
              >
                <input
                  ref={i === 0 ? ref : undefined}
                  type="radio"
                  name={`part-${index}`}
                  className="absolute inset-0 size-full cursor-pointer appearance-none opacity-0"
                  checked={value === d}
                  onChange={() => onChange(d)}
                  onBlur={onBlur}
                  aria-label={d === 'absent' ? `${name} ${word.toLowerCase()}` : `${word} ${name}`}
                />
                <Icon name={TILE[d].icon} size={22} />
                {word}
              </label>
            );
          })}
        </div>
      </div>
      {error && (
        <p id={errorId} className="flex items-start gap-1.5 font-medium text-bad">
          <Icon name="bad" size={18} className="mt-0.5" />
          {error}
        </p>
      )}
      {value === 'scrap' && (
        <TextField
          name={`parts.${index}.reason`}
          label={t('teardown.scrapReason', { part: name })}
          optional
          autoFocus
        />
      )}
    </li>
  );
}

type Condition = CoreReceipt['condition'];

/** What the dock wrote about the core's state, so teardown starts from it rather than from nothing. */
function IntakeCondition({
  condition,
  preset,
}: {
  condition: Condition | 'not-allowed' | 'not-loaded';
  /** How many part rows below were set to "not there" from it. */
  preset: number;
}) {
  if (condition === 'not-allowed' || condition === 'not-loaded') {
    return (
      <Notice tone="info" title={t('teardown.conditionHidden')}>
        {t(condition === 'not-allowed' ? 'teardown.notYourRole' : 'teardown.notLoaded')} {t('teardown.willSay')}
      </Notice>
    );
  }
  const { missing, damage } = condition;
  if (missing.length === 0 && damage.length === 0) {
    return (
      <Notice tone="info" title={t('teardown.atIntake')}>
        {t('teardown.completeNoDamage')}
      </Notice>
    );
  }
  return (
    <Notice tone="hold" title={t('teardown.atIntake')}>
      <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1">
        <dt className="font-semibold">{t('teardown.missing')}</dt>
        <dd>{missing.length ? missing.map((m) => label(CORE_PART_LABELS[m])).join(', ') : t('teardown.nothing')}</dd>
        <dt className="font-semibold">{t('teardown.damage')}</dt>
        <dd>{damage.length ? damage.map((d) => label(DAMAGE_LABELS[d])).join(', ') : t('teardown.noneSeen')}</dd>
      </dl>
      {missing.length > 0 && <p className="mt-2">{t(preset > 0 ? 'teardown.presetRows' : 'teardown.noPresetRows')}</p>}
    </Notice>
  );
}

type TeardownFormProps = {
  item: ItemJson;
  /** The condition intake recorded, or why it is not to hand. */
  condition: Condition | 'not-allowed' | 'not-loaded';
  onDone: (core: CoreDetail) => void;
};

export function TeardownForm({ item, condition, onDone }: TeardownFormProps) {
  const tearDown = useTearDownCore();
  const rows = useMemo(() => rowsFor(item.family), [item.family]);
  const missing = rows.map((r) => missingAtIntake(r, typeof condition === 'object' ? condition.missing : []));
  const schema = useMemo(() => teardownForm(rows), [rows]);
  const hazard = item.route.find((s) => s.code === 'teardown')?.hazard ?? item.currentStage?.hazard;

  return (
    <Form
      schema={schema}
      defaultValues={{
        parts: rows.map((r, i) => ({
          decision: missing[i] || r.optional ? ('absent' as const) : undefined,
          reason: '',
        })),
        notes: '',
      }}
      onSubmit={async (body) => onDone(await tearDown.mutateAsync({ serial: item.serial, body }))}
    >
      <IntakeCondition condition={condition} preset={missing.filter(Boolean).length} />
      <Caution title={t('teardown.heavyTitle')} icon="hoist">
        {hazard ? localizeHazard(hazard) : t('teardown.heavyHazard')} {t('teardown.heavyProcedure')}
      </Caution>
      <Card labelledBy="parts-heading">
        <CardHeader
          id="parts-heading"
          title={t('teardown.majorParts')}
          description={t('teardown.majorPartsIntro', { serial: item.serial })}
        />
        <CardBody>
          <ul className="divide-y divide-rule">
            {rows.map((r, i) => (
              <PartDecision key={`${r.kind}-${r.position ?? ''}`} row={r} index={i} missing={missing[i] ?? false} />
            ))}
          </ul>
        </CardBody>
      </Card>
      <Card labelledBy="wear-heading">
        <CardBody>
          <h2 id="wear-heading" className="font-semibold">
            {t('teardown.wearTitle')}
          </h2>
          <p className="mt-1 text-ink-soft">
            {WEAR_PARTS.map((p) => label(p)).join(', ')}. {t('teardown.wearBody')}
          </p>
        </CardBody>
      </Card>
      {/* on a card: the hint's grey reads at 4.5:1 on a card, not on the page's ground */}
      <Card as="div">
        <CardBody>
          <TextAreaField name="notes" label={t('form.notes')} hint={t('teardown.notesHint')} />
        </CardBody>
      </Card>
      <div className="flex justify-end">
        <SubmitButton size="lg">{t('teardown.record')}</SubmitButton>
      </div>
    </Form>
  );
}
