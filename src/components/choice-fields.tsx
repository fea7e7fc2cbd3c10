import { useId, type ReactNode } from 'react';
import { useController, useFormContext, type FieldValues } from 'react-hook-form';
import { localizeText } from '../lib/server-messages';
import { errorId, hintId } from './ui/field';
import { Icon } from './ui/icon';

/**
 * Choices as large tiles rather than bare dots: a gloved finger hits the whole tile, and the picked
 * one reads by its thick outline and filled mark as well as its tint.
 */
const tileClass =
  'flex min-h-11 floor:min-h-12 cursor-pointer items-center gap-2.5 rounded-control border border-rule-strong bg-field px-3 py-2 ' +
  'text-ink hover:border-ink-soft has-checked:border-2 has-checked:border-accent has-checked:bg-accent-tint ' +
  'has-checked:font-semibold has-focus-visible:outline-3 has-focus-visible:outline-offset-2 has-focus-visible:outline-accent';

function useError(name: string) {
  const { formState } = useFormContext<FieldValues>();
  const error = name
    .split('.')
    .reduce<unknown>((e, k) => (e as Record<string, unknown> | undefined)?.[k], formState.errors) as
    { message?: string } | undefined;
  return error?.message && localizeText(error.message);
}

type GroupShellProps = {
  id: string;
  legend: ReactNode;
  hint?: ReactNode;
  error?: string;
  children: ReactNode;
  columns?: 2 | 3 | 4;
};

const colsClass = { 2: 'sm:grid-cols-2', 3: 'sm:grid-cols-3', 4: 'sm:grid-cols-2 lg:grid-cols-4' } as const;

function GroupShell({ id, legend, hint, error, children, columns = 2 }: GroupShellProps) {
  const described = [hint ? hintId(id) : null, error ? errorId(id) : null].filter(Boolean).join(' ');
  return (
    <fieldset aria-describedby={described || undefined} aria-invalid={error ? true : undefined}>
      <legend className="mb-1.5 block text-sm font-medium text-ink floor:text-base">{legend}</legend>
      <div className={`grid grid-cols-1 gap-2 ${colsClass[columns]}`}>{children}</div>
      {hint && (
        <p id={hintId(id)} className="mt-1.5 text-sm text-ink-faint">
          {hint}
        </p>
      )}
      {error && (
        <p id={errorId(id)} className="mt-1.5 flex items-start gap-1.5 text-sm font-medium text-bad">
          <Icon name="bad" size={16} className="mt-0.5 shrink-0" />
          {error}
        </p>
      )}
    </fieldset>
  );
}

export type Choice<V> = { value: V; label: string };

type RadioGroupFieldProps<V> = {
  name: string;
  legend: ReactNode;
  options: Choice<V>[];
  hint?: ReactNode;
  columns?: 2 | 3 | 4;
};

/** One of a few values; the value may be a boolean or a code, compared as it is (not as text). */
export function RadioGroupField<V extends string | boolean>({
  name,
  legend,
  options,
  hint,
  columns,
}: RadioGroupFieldProps<V>) {
  const id = useId();
  const {
    field: { ref, value, onChange, onBlur },
  } = useController({ name });
  const error = useError(name);
  return (
    <GroupShell id={id} legend={legend} hint={hint} error={error} columns={columns}>
      {options.map((o, i) => (
        <label key={String(o.value)} className={tileClass}>
          <input
            ref={i === 0 ? ref : undefined}
            type="radio"
            name={`${id}-${name}`}
            className="size-5 shrink-0 accent-accent"
            checked={value === o.value}
            onChange={() => onChange(o.value)}
            onBlur={onBlur}
          />
          {o.label}
        </label>
      ))}
    </GroupShell>
  );
}

type CheckboxListFieldProps<V extends string> = {
  name: string;
  legend: ReactNode;
  options: Choice<V>[];
  hint?: ReactNode;
  columns?: 2 | 3 | 4;
};

/** Any number of values, kept in the order the options are listed. */
export function CheckboxListField<V extends string>({
  name,
  legend,
  options,
  hint,
  columns,
}: CheckboxListFieldProps<V>) {
  const id = useId();
  const {
    field: { ref, value, onChange, onBlur },
  } = useController({ name });
  const error = useError(name);
  const picked = new Set<V>((value as V[] | undefined) ?? []);
  const toggle = (v: V) => {
    const next = new Set(picked);
    if (next.has(v)) next.delete(v);
    else next.add(v);
    onChange(options.map((o) => o.value).filter((x) => next.has(x)));
  };
  return (
    <GroupShell id={id} legend={legend} hint={hint} error={error} columns={columns}>
      {options.map((o, i) => (
        <label key={o.value} className={tileClass}>
          <input
            ref={i === 0 ? ref : undefined}
            type="checkbox"
            className="size-5 shrink-0 accent-accent"
            checked={picked.has(o.value)}
            onChange={() => toggle(o.value)}
            onBlur={onBlur}
          />
          {o.label}
        </label>
      ))}
    </GroupShell>
  );
}

/** A single yes/no, e.g. "This is a different core". */
export function CheckboxField({ name, label }: { name: string; label: ReactNode }) {
  const {
    field: { ref, value, onChange, onBlur },
  } = useController({ name });
  const error = useError(name);
  const id = useId();
  return (
    <div>
      <label className={tileClass}>
        <input
          ref={ref}
          type="checkbox"
          className="size-5 shrink-0 accent-accent"
          checked={value === true}
          onChange={(e) => onChange(e.target.checked)}
          onBlur={onBlur}
          aria-describedby={error ? errorId(id) : undefined}
        />
        {label}
      </label>
      {error && (
        <p id={errorId(id)} className="mt-1.5 text-sm font-medium text-bad">
          {error}
        </p>
      )}
    </div>
  );
}
