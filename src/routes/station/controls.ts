/**
 * The station's own control sizes: every box at least 44 px high, text at 18 px or more, whatever
 * the role's density, because the tablet is read at arm's length and worked with gloves.
 */
export const bigControl =
  'w-full rounded-control border-2 border-rule-strong bg-field px-3 text-lg text-ink placeholder:text-ink-faint ' +
  'hover:border-ink-soft aria-[invalid=true]:border-bad disabled:bg-sunk disabled:text-ink-soft';

export const bigLabel = 'text-lg font-semibold text-ink';
