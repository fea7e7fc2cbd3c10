import type { LabelHTMLAttributes, ReactNode } from 'react';
import { Icon } from './icon';

export function Label(props: LabelHTMLAttributes<HTMLLabelElement>) {
  return <label className="block text-sm font-medium text-ink floor:text-base" {...props} />;
}

/** Ids a control points at with aria-describedby, so its hint and error are read with it. */
export const hintId = (id: string) => `${id}-hint`;
export const errorId = (id: string) => `${id}-error`;

export function describedBy(id: string, hint: unknown, error: unknown): string | undefined {
  const ids = [hint ? hintId(id) : null, error ? errorId(id) : null].filter(Boolean);
  return ids.length ? ids.join(' ') : undefined;
}

type FieldProps = { id: string; label: ReactNode; hint?: ReactNode; error?: string; children: ReactNode };

/** Label above, control, then the hint (limits, rules) and the error in words with a mark. */
export function Field({ id, label, hint, error, children }: FieldProps) {
  return (
    <div className="flex flex-col gap-1.5">
      <Label htmlFor={id}>{label}</Label>
      {children}
      {hint && (
        <p id={hintId(id)} className="text-sm text-ink-faint">
          {hint}
        </p>
      )}
      {error && (
        <p id={errorId(id)} className="flex items-start gap-1.5 text-sm font-medium text-bad">
          <Icon name="bad" size={16} className="mt-0.5 shrink-0" />
          {error}
        </p>
      )}
    </div>
  );
}
