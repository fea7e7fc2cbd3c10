import type { ReactNode } from 'react';
import { useFormContext, useWatch } from 'react-hook-form';
import type { z } from 'zod';
import { useT } from '../lib/i18n';
import { Icon } from './ui/icon';

export type SummarySection = { id: string; title: string; fields: string[] };

/**
 * What a long form still lacks, section by section, worked out with the same zod schema the form
 * submits with: it sits beside the form (sticky) on a wide screen and under it on a narrow one, with
 * the submit button, so nobody scrolls up and down hunting for the one empty field.
 */
export function FormSummary({
  schema,
  sections,
  labels,
  children,
}: {
  schema: z.ZodType;
  sections: SummarySection[];
  /** A field's name as its label says it, for the list of what is missing. */
  labels: Record<string, string>;
  /** The submit button. */
  children: ReactNode;
}) {
  const t = useT();
  const { control } = useFormContext();
  const values = useWatch({ control });
  const parsed = schema.safeParse(values);
  const missing = new Set(parsed.success ? [] : parsed.error.issues.map((i) => String(i.path[0] ?? '')));
  const open = sections.map((s) => ({ ...s, lacks: s.fields.filter((f) => missing.has(f)) }));
  const left = open.reduce((n, s) => n + s.lacks.length, 0);

  return (
    <aside aria-labelledby="form-summary-heading" className="lg:sticky lg:top-4 lg:self-start">
      <div className="rounded-card border border-rule bg-card shadow-card">
        <div className="border-b border-rule px-4 py-3">
          <h2 id="form-summary-heading" className="font-semibold">
            {t('summary.heading')}
          </h2>
          <p aria-live="polite" className="text-sm text-ink-soft">
            {left === 0 ? t('summary.allFilled') : t('summary.left', { count: left })}
          </p>
        </div>
        <ol className="divide-y divide-rule">
          {open.map((s) => (
            <li key={s.id}>
              <a
                href={`#${s.id}`}
                className="flex min-h-11 items-start gap-2 px-4 py-2 hover:bg-sunk floor:min-h-12"
                onClick={(e) => {
                  // jump without changing the address (the form's filters and state stay put)
                  e.preventDefault();
                  document.getElementById(s.id)?.scrollIntoView({ block: 'start' });
                }}
              >
                <Icon
                  name={s.lacks.length ? 'wait' : 'ok'}
                  size={18}
                  className={`mt-0.5 shrink-0 ${s.lacks.length ? 'text-hold' : 'text-ok'}`}
                />
                <span className="flex flex-col">
                  <span className="font-medium text-ink">{s.title}</span>
                  <span className="text-sm text-ink-soft">
                    {s.lacks.length
                      ? t('summary.missing', { fields: s.lacks.map((f) => labels[f] ?? f).join(', ') })
                      : t('summary.done')}
                  </span>
                </span>
              </a>
            </li>
          ))}
        </ol>
        <div className="grid border-t border-rule px-4 py-3">{children}</div>
      </div>
    </aside>
  );
}
