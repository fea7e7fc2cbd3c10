import { useId, type HTMLInputTypeAttribute, type ReactNode } from 'react';
import { localizeText } from '../lib/server-messages';
import { useFormContext, type FieldValues, type Path, type RegisterOptions } from 'react-hook-form';
import { describedBy, Field } from './ui/field';
import { Input, Textarea } from './ui/input';
import { Select, type Option, type OptionGroup } from './ui/select';

/** Binds a named field of the surrounding <Form> to a labelled control with hint and error. */
function useBound(name: string) {
  const id = useId();
  const { register, formState } = useFormContext<FieldValues>();
  const error = name
    .split('.')
    .reduce<unknown>((e, k) => (e as Record<string, unknown> | undefined)?.[k], formState.errors) as
    { message?: string } | undefined;
  return { id, register, error: error?.message && localizeText(error.message) };
}

type Common = { name: string; label: ReactNode; hint?: ReactNode; disabled?: boolean; autoFocus?: boolean };

type TextFieldProps = Common & {
  type?: HTMLInputTypeAttribute;
  autoComplete?: string;
  mono?: boolean;
  placeholder?: string;
  /** Bounds for a date or number field, as the browser's own picker honours them. */
  min?: string;
  max?: string;
  /** Left empty, the field is absent (undefined) rather than "", so an optional schema key accepts it. */
  optional?: boolean;
  /** The on-screen keyboard to offer, e.g. `numeric` for a one-time code. */
  inputMode?: 'text' | 'numeric' | 'decimal' | 'email';
};

const blankToUndefined = (v: unknown) => (typeof v === 'string' && v.trim() === '' ? undefined : v);

export function TextField({
  name,
  label,
  hint,
  type = 'text',
  autoComplete,
  mono,
  disabled,
  autoFocus,
  placeholder,
  min,
  max,
  optional = false,
  inputMode,
}: TextFieldProps) {
  const { id, register, error } = useBound(name);
  return (
    <Field id={id} label={label} hint={hint} error={error}>
      <Input
        id={id}
        type={type}
        inputMode={inputMode}
        mono={mono}
        autoComplete={autoComplete}
        disabled={disabled}
        autoFocus={autoFocus}
        placeholder={placeholder}
        min={min}
        max={max}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(id, hint, error)}
        {...register(name, optional ? { setValueAs: blankToUndefined } : {})}
      />
    </Field>
  );
}

export function TextAreaField({ name, label, hint, optional = false }: Common & { optional?: boolean }) {
  const { id, register, error } = useBound(name);
  return (
    <Field id={id} label={label} hint={hint} error={error}>
      <Textarea
        id={id}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(id, hint, error)}
        {...register(name, optional ? { setValueAs: blankToUndefined } : {})}
      />
    </Field>
  );
}

type NumberFieldProps = Common & { unit?: string; integer?: boolean; nullable?: boolean };

/** Reads a number (or null when `nullable` and left empty); an empty required field is NaN, which the schema refuses. */
export function NumberField({
  name,
  label,
  hint,
  unit,
  integer = false,
  nullable = false,
  disabled,
}: NumberFieldProps) {
  const { id, register, error } = useBound(name);
  const options: RegisterOptions<FieldValues, Path<FieldValues>> = {
    setValueAs: (v: unknown) => {
      if (v === '' || v === null || v === undefined) return nullable ? null : Number.NaN;
      return typeof v === 'number' ? v : Number(String(v).replace(',', '.'));
    },
  };
  return (
    <Field id={id} label={unit ? `${String(label)} (${unit})` : label} hint={hint} error={error}>
      <Input
        id={id}
        type="text"
        inputMode={integer ? 'numeric' : 'decimal'}
        mono
        disabled={disabled}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(id, hint, error)}
        {...register(name, options)}
      />
    </Field>
  );
}

type SelectFieldProps = Common & {
  options?: Option[];
  groups?: OptionGroup[];
  placeholder?: string;
  emptyIsNull?: boolean;
  /** The chosen value is an id: sent as a number, and the empty choice as absent. */
  numeric?: boolean;
  /** The empty choice is absent (undefined) rather than "". */
  optional?: boolean;
};

export function SelectField({
  name,
  label,
  hint,
  options,
  groups,
  placeholder,
  emptyIsNull = false,
  numeric = false,
  optional = false,
  disabled,
}: SelectFieldProps) {
  const { id, register, error } = useBound(name);
  const setValueAs = (v: unknown) => {
    if (v === '' || v === undefined) return emptyIsNull ? null : numeric || optional ? undefined : v;
    return numeric ? Number(v) : v;
  };
  return (
    <Field id={id} label={label} hint={hint} error={error}>
      <Select
        id={id}
        options={options}
        groups={groups}
        placeholder={placeholder}
        disabled={disabled}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(id, hint, error)}
        {...register(name, emptyIsNull || numeric || optional ? { setValueAs } : {})}
      />
    </Field>
  );
}
