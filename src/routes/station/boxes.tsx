import { useId } from 'react';
import { useFormContext } from 'react-hook-form';
import { Icon, type IconName } from '../../components/ui/icon';
import { useFormState } from './form-state';
import type { DerivedCell } from './layout';
import {
  readingName,
  slotKey,
  standingOf,
  unreadableMessage,
  type Slot,
  type SlotValue,
  type Standing,
} from './readings';
import { formatValue } from './numbers';
import { whereKey } from './submit';
import { t } from '../../lib/i18n';

type Values = { slots: SlotValue[] };

const sentence = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);

type Cue = { icon: IconName | null; text: string; cls: string };

function cueOf(standing: Standing, resolution: number | null, problem: string | undefined, missing: boolean): Cue {
  if (problem) return { icon: 'bad', text: sentence(problem), cls: 'font-semibold text-bad' };
  switch (standing.kind) {
    case 'pass':
      return { icon: 'ok', text: 'OK', cls: 'text-ok' };
    case 'high':
      return {
        icon: 'bad',
        text: t('cue.high', { by: formatValue(standing.by, resolution) }),
        cls: 'font-semibold text-bad',
      };
    case 'low':
      return {
        icon: 'bad',
        text: t('cue.low', { by: formatValue(standing.by, resolution) }),
        cls: 'font-semibold text-bad',
      };
    case 'fail':
      return { icon: 'bad', text: t('cue.outOfTolerance'), cls: 'font-semibold text-bad' };
    default:
      return missing
        ? { icon: 'wait', text: t('cue.missing'), cls: 'font-semibold text-hold' }
        : { icon: null, text: '', cls: '' };
  }
}

// the box itself: thick outline, and for a failing reading a tinted well as well as the mark below
const BOX: Record<'idle' | 'pass' | 'bad' | 'missing', string> = {
  idle: 'border-rule-strong bg-field',
  pass: 'border-ok bg-field',
  bad: 'border-bad bg-bad-tint',
  missing: 'border-dashed border-hold bg-field',
};

/** One measured reading: a large numeric box, its limits judged as the operator types, a cue in words below. */
export function ReadingBox({ slot, label }: { slot: Slot; label?: string }) {
  const id = useId();
  const { register } = useFormContext<Values>();
  const { judged, problems, attempted, clearProblem } = useFormState();
  const typed = judged.typed[slot.index] ?? null;
  const reading = judged.readings.get(slot.key);
  const standing = standingOf(typed, reading);
  const resolution = slot.char.rule?.resolution ?? slot.char.resolution;
  const problem = problems[slot.key] ?? (typed ? (unreadableMessage(slot.char, typed) ?? undefined) : undefined);
  const missing = attempted && typed?.state === 'empty' && !slot.char.optional;
  let cue = cueOf(standing, resolution, problem, missing);
  // typed in another unit: the cue says what it reads in the rule's unit, which is what is judged
  if (!problem && typed && 'entered' in typed && typed.entered && slot.char.unit) {
    const inRule = `${formatValue(reading?.rounded ?? typed.value, resolution)} ${slot.char.unit}`;
    const by = standing.kind === 'high' || standing.kind === 'low' ? ` ${slot.char.unit}` : '';
    cue = { ...cue, text: cue.text ? `${cue.text}${by} · ${inRule}` : `= ${inRule}` };
  }
  const bad = !!problem || standing.kind === 'high' || standing.kind === 'low' || standing.kind === 'fail';
  const look = bad ? 'bad' : standing.kind === 'pass' ? 'pass' : missing ? 'missing' : 'idle';
  const name = readingName(slot.char, slot.position);
  return (
    <div className="flex min-w-0 flex-col gap-1">
      {label && (
        <label htmlFor={id} className="text-base font-medium text-ink">
          {label}
        </label>
      )}
      <input
        id={id}
        type="text"
        inputMode="decimal"
        autoComplete="off"
        spellCheck={false}
        enterKeyHint="next"
        data-field=""
        data-key={slot.key}
        aria-label={name}
        aria-invalid={bad ? true : undefined}
        aria-describedby={`${id}-cue`}
        className={`h-14 w-full min-w-0 rounded-control border-2 px-2.5 font-mono text-xl font-medium text-ink hover:border-ink-soft ${BOX[look]}`}
        {...register(`slots.${slot.index}.text`, { onChange: () => clearProblem(slot.key) })}
      />
      <p id={`${id}-cue`} className={`flex min-h-6 items-start gap-1 text-base leading-6 ${cue.cls}`}>
        {cue.icon && <Icon name={cue.icon} size={18} className="mt-[3px] shrink-0" />}
        <span>{cue.text}</span>
        {bad && reading?.verdict === 'fail' && <span className="sr-only">: {reading.reason}</span>}
      </p>
    </div>
  );
}

const TILE = {
  pass: { word: 'form.pass', icon: 'ok', on: 'has-checked:border-ok has-checked:bg-ok has-checked:text-white' },
  fail: { word: 'form.fail', icon: 'bad', on: 'has-checked:border-bad has-checked:bg-bad has-checked:text-white' },
} as const;

/** A pass/fail check at one position: two large tiles, and on a fail a box saying where. */
export function CheckTiles({ slot }: { slot: Slot }) {
  const id = useId();
  const { register } = useFormContext<Values>();
  const { values, problems, attempted, clearProblem } = useFormState();
  const choice = values[slot.index]?.choice ?? '';
  const problem = problems[slot.key];
  const missing = attempted && choice === '' && !slot.char.optional;
  const whereLabel =
    slot.position.code === ''
      ? t('form.where', { name: slot.char.name })
      : t('form.whereAt', { name: slot.char.name, position: slot.position.label });
  return (
    <div className="flex flex-col gap-3">
      <div
        role="radiogroup"
        aria-label={readingName(slot.char, slot.position)}
        aria-describedby={problem || missing ? `${id}-cue` : undefined}
        className="flex flex-wrap items-center gap-3"
      >
        {slot.position.code !== '' && <span className="min-w-32 text-base font-medium">{slot.position.label}</span>}
        {(['pass', 'fail'] as const).map((c) => (
          <label
            key={c}
            className={`relative flex min-h-14 w-36 cursor-pointer items-center justify-center gap-2 rounded-control border-2 bg-field px-4 text-xl font-semibold text-ink hover:border-ink-soft has-focus-visible:outline-3 has-focus-visible:outline-offset-2 has-focus-visible:outline-accent ${missing ? 'border-dashed border-hold' : 'border-rule-strong'} ${TILE[c].on}`}
          >
            <input
              type="radio"
              value={c}
              data-field=""
              data-key={c === 'pass' ? slot.key : undefined}
              className="absolute inset-0 size-full cursor-pointer appearance-none opacity-0"
              {...register(`slots.${slot.index}.choice`, { onChange: () => clearProblem(slot.key) })}
            />
            <Icon name={TILE[c].icon} size={24} />
            {t(TILE[c].word)}
          </label>
        ))}
      </div>
      {(problem || missing) && (
        <p
          id={`${id}-cue`}
          className={`flex items-start gap-1 text-base font-semibold ${problem ? 'text-bad' : 'text-hold'}`}
        >
          <Icon name={problem ? 'bad' : 'wait'} size={18} className="mt-0.5 shrink-0" />
          {problem ? sentence(problem) : t('cue.choosePassFail')}
        </p>
      )}
      {choice === 'fail' && (
        <WhereBox
          slot={slot}
          label={whereLabel}
          problem={problems[whereKey(slot.key)]}
          clear={() => clearProblem(whereKey(slot.key))}
        />
      )}
    </div>
  );
}

function WhereBox({ slot, label, problem, clear }: { slot: Slot; label: string; problem?: string; clear: () => void }) {
  const id = useId();
  const { register } = useFormContext<Values>();
  return (
    <div className="flex max-w-xl flex-col gap-1.5">
      <label htmlFor={id} className="text-base font-semibold">
        {label}
      </label>
      <input
        id={id}
        type="text"
        autoComplete="off"
        data-field=""
        data-key={whereKey(slot.key)}
        maxLength={200}
        placeholder={t('cue.wherePlaceholder')}
        aria-required={slot.char.critical || undefined}
        aria-invalid={problem ? true : undefined}
        aria-describedby={`${id}-hint`}
        className="h-14 w-full rounded-control border-2 border-rule-strong bg-field px-3 text-lg text-ink placeholder:text-ink-faint aria-[invalid=true]:border-bad"
        {...register(`slots.${slot.index}.where`, { onChange: clear })}
      />
      <p id={`${id}-hint`} className="text-base">
        {problem ? (
          <span className="flex items-start gap-1 font-semibold text-bad">
            <Icon name="bad" size={18} className="mt-0.5 shrink-0" />
            {sentence(problem)}
          </span>
        ) : (
          <span className="text-ink-soft">{t(slot.char.critical ? 'cue.whereCritical' : 'cue.whereHint')}</span>
        )}
      </p>
    </div>
  );
}

/** A value worked out from the readings (out-of-round, taper, flatness, spread), read-only, judged live. */
export function DerivedValue({
  cell,
  label,
  labelClass = '',
}: {
  cell: DerivedCell;
  label?: string;
  labelClass?: string;
}) {
  const { judged } = useFormState();
  const r = judged.readings.get(slotKey(cell.char.code, cell.position.code));
  const resolution = cell.char.rule?.resolution ?? cell.char.resolution;
  const unit = cell.char.unit ? ` ${cell.char.unit}` : '';
  const shown = r && r.verdict !== null ? formatValue(r.rounded ?? r.value ?? 0, resolution) : null;
  const standing = standingOf(null, r);
  const word =
    standing.kind === 'pass' ? 'OK' : standing.kind === 'low' ? 'Low' : standing.kind === 'high' ? 'High' : 'Out';
  return (
    <p className="flex min-h-7 flex-wrap items-baseline gap-x-1.5 text-lg leading-7">
      <span className="sr-only">{readingName(cell.char, cell.position)}: </span>
      {label && (
        <span aria-hidden="true" className={`text-base text-ink-soft ${labelClass}`}>
          {label}
        </span>
      )}
      {shown === null ? (
        <span className="font-mono text-ink-soft" title="Worked out once its readings are in">
          —<span className="sr-only">not worked out yet</span>
        </span>
      ) : (
        <span
          className={`inline-flex items-center gap-1 font-mono font-semibold ${r?.verdict === 'fail' ? 'text-bad' : 'text-ok'}`}
        >
          {shown}
          <span className="sr-only">{unit}</span>
          <Icon name={r?.verdict === 'fail' ? 'bad' : 'ok'} size={18} className="self-center" />
          <span className="font-sans text-sm">{word}</span>
        </span>
      )}
    </p>
  );
}
