import { useId } from 'react';
import { useController, useFormState } from 'react-hook-form';
import { SEVERITIES } from '../../../shared/schemas/ncr';
import type { Severity } from '../../api/ncrs/types';
import { errorId } from '../../components/ui/field';
import { Icon } from '../../components/ui/icon';
import { SEVERITY_LABELS } from './ncr-badges';

const EXPLAIN: Record<Severity, string> = {
  critical: 'A safety risk, or a part that could fail in the engine. Quality and the supervisor are told at once.',
  major: 'The part cannot be used as it is: out of limits, cracked, leaking, wrong.',
  minor: 'Small or cosmetic: the part would work, but it is not as it should be.',
};

/** Three big tiles, each with its word and one plain line saying when to choose it. */
export function SeverityField({ name }: { name: string }) {
  const id = useId();
  const {
    field: { ref, value, onChange, onBlur },
  } = useController({ name });
  const { errors } = useFormState({ name });
  const error = (errors[name] as { message?: string } | undefined)?.message;
  return (
    <fieldset aria-describedby={error ? errorId(id) : undefined} aria-invalid={error ? true : undefined}>
      <legend className="mb-1.5 block text-base font-medium text-ink">Severity</legend>
      <div className="grid grid-cols-1 gap-2 md:grid-cols-3">
        {SEVERITIES.map((s, i) => (
          <label
            key={s}
            className={`flex min-h-16 cursor-pointer items-start gap-3 rounded-control border border-rule-strong bg-field px-3.5 py-3 hover:border-ink-soft has-checked:border-2 has-checked:border-accent has-checked:bg-accent-tint has-focus-visible:outline-3 has-focus-visible:outline-offset-2 has-focus-visible:outline-accent ${s === 'critical' ? 'border-l-4 border-l-bad' : ''}`}
          >
            <input
              ref={i === 0 ? ref : undefined}
              type="radio"
              name={`${id}-${name}`}
              className="mt-0.5 size-6 shrink-0 accent-accent"
              checked={value === s}
              onChange={() => onChange(s)}
              onBlur={onBlur}
              aria-labelledby={`${id}-${s}`}
              aria-describedby={`${id}-${s}-why`}
            />
            <span className="flex flex-col gap-0.5">
              <span id={`${id}-${s}`} className="flex items-center gap-1.5 text-lg font-semibold">
                {s === 'critical' && <Icon name="alert" size={20} className="text-bad" />}
                {SEVERITY_LABELS[s]}
              </span>
              <span id={`${id}-${s}-why`} className="text-[0.95rem] text-ink-soft">
                {EXPLAIN[s]}
              </span>
            </span>
          </label>
        ))}
      </div>
      {error && (
        <p id={errorId(id)} className="mt-1.5 flex items-start gap-1.5 text-base font-medium text-bad">
          <Icon name="bad" size={18} className="mt-0.5 shrink-0" />
          {error}
        </p>
      )}
    </fieldset>
  );
}
