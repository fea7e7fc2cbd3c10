import { createContext, useContext, type ReactNode } from 'react';
import { LOT_KIND_LABELS, LOT_KINDS } from '../../../shared/schemas/build';
import { Icon } from '../../components/ui/icon';
import { Notice } from '../../components/ui/notice';
import { t, useT } from '../../lib/i18n';
import { label } from '../../lib/server-messages';
import type { Slot } from './slots';

/**
 * The server's refusals of the last try, keyed as it sends them: `block`, `heads.1`,
 * `lots.pistons`, `lots.3.lotCode` … Each slot and lot row shows its own; the summary lists all.
 */
export type Refusal = { title: string; fields: Record<string, string> };

type RefusalState = { refusal: Refusal | null; clear: (match: (key: string) => boolean) => void };

const RefusalContext = createContext<RefusalState>({ refusal: null, clear: () => undefined });

export function RefusalProvider({ value, children }: { value: RefusalState; children: ReactNode }) {
  return <RefusalContext.Provider value={value}>{children}</RefusalContext.Provider>;
}

export const useRefusals = () => useContext(RefusalContext);

/** The keys that belong to one slot: its own, and what is said about the heads as a pair. */
export const slotKeys = (slot: Slot) => (key: string) =>
  key === slot.name || (slot.kind === 'cylinder_head' && key === 'heads');

/** The keys that belong to one lot row, by its kind and by its place in the list. */
export const lotKeys = (index: number) => (key: string) =>
  key === `lots.${LOT_KINDS[index]}` || key === `lots.${index}` || key.startsWith(`lots.${index}.`);

export function messagesFor(refusal: Refusal | null, match: (key: string) => boolean): string[] {
  if (!refusal) return [];
  return [...new Set(Object.entries(refusal.fields).flatMap(([k, m]) => (match(k) ? [m] : [])))];
}

/** Refusals under the control they are about, in words with the mark. */
export function RefusalLines({ messages, id }: { messages: string[]; id?: string }) {
  if (!messages.length) return null;
  return (
    <ul id={id} className="flex flex-col gap-1">
      {messages.map((m) => (
        <li key={m} className="flex items-start gap-1.5 font-medium text-bad">
          <Icon name="bad" size={18} className="mt-0.5 shrink-0" />
          <span>
            <span className="sr-only">{t('refusal.refused')} </span>
            {m}
          </span>
        </li>
      ))}
    </ul>
  );
}

type Where = { label: string; selector: string | null };

function whereOf(key: string, slots: Slot[]): Where {
  const slot = slots.find((s) => s.name === key);
  if (slot) return { label: label(slot.label), selector: `[name="${slot.name}"]` };
  if (key === 'heads') return { label: t('refusal.heads'), selector: '[name="heads.0"]' };
  if (key === 'family') return { label: t('build.family'), selector: '[name="family"]' };
  const byKind = /^lots\.([a-z_]+)$/.exec(key);
  const kind = LOT_KINDS.find((k) => k === byKind?.[1]);
  if (kind) {
    const i = LOT_KINDS.indexOf(kind);
    return {
      label: label(LOT_KIND_LABELS[kind]),
      selector: kind === 'pistons' ? `[name="lots.${i}.oversizeIn"]` : `[name="lots.${i}.lotCode"]`,
    };
  }
  const byIndex = /^lots\.(\d+)(?:\.(\w+))?$/.exec(key);
  const at = byIndex ? LOT_KINDS[Number(byIndex[1])] : undefined;
  if (byIndex && at) {
    return { label: label(LOT_KIND_LABELS[at]), selector: `[name="lots.${byIndex[1]}.${byIndex[2] ?? 'lotCode'}"]` };
  }
  if (key === 'lots') return { label: t('build.lots'), selector: null };
  return { label: t('build.title'), selector: null };
}

const goTo = (selector: string) => {
  const el = document.querySelector<HTMLElement>(selector);
  el?.scrollIntoView({ block: 'center' });
  el?.focus({ preventScroll: true });
};

/** Every refusal of the last try in one list, each able to take the user to its slot or row. */
export function RefusalSummary({ slots }: { slots: Slot[] }) {
  const { refusal } = useRefusals();
  useT();
  if (!refusal) return null;
  const entries = Object.entries(refusal.fields);
  return (
    <Notice tone="bad" live="alert" title={refusal.title}>
      {entries.length > 0 && (
        <ul className="mt-1 flex flex-col gap-1.5">
          {entries.map(([key, message]) => {
            const where = whereOf(key, slots);
            return (
              <li key={key}>
                {where.selector ? (
                  <button
                    type="button"
                    onClick={() => goTo(where.selector!)}
                    className="inline-flex min-h-11 floor:min-h-12 items-center font-semibold text-accent underline underline-offset-4"
                  >
                    <span className="sr-only">{t('refusal.goTo')} </span>
                    {where.label}
                  </button>
                ) : (
                  <span className="font-semibold">{where.label}</span>
                )}
                : {message}
              </li>
            );
          })}
        </ul>
      )}
    </Notice>
  );
}
