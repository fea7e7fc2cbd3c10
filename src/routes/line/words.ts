import type { WipState } from '../../../shared/schemas/line';

export const WIP_STATE_WORDS: Record<WipState, string> = {
  waiting: 'Waiting',
  in_work: 'In work',
  on_hold: 'On hold',
};

/** An age in the unit a person thinks in: minutes, hours, then days. */
export function formatAge(hours: number): string {
  if (hours < 1) return `${Math.max(0, Math.round(hours * 60))} min`;
  if (hours < 48) return `${Math.round(hours)} h`;
  return `${Math.round(hours / 24)} days`;
}

export const percent = (v: number | null, digits = 1) => (v === null ? '—' : `${(v * 100).toFixed(digits)} %`);
