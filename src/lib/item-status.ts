import type { Tone } from '../components/ui/badge';

/** Item states in Coretrail's words, each with the badge tone (colour, outline and mark) it shows in. */
const STATUS: Record<string, { label: string; tone: Tone }> = {
  received: { label: 'Awaiting teardown', tone: 'wait' },
  rejected: { label: 'Rejected', tone: 'bad' },
  torn_down: { label: 'Torn down', tone: 'neutral' },
  in_process: { label: 'On its route', tone: 'accent' },
  in_stock: { label: 'In stock', tone: 'neutral' },
  on_hold: { label: 'On hold', tone: 'hold' },
  finished: { label: 'Finished', tone: 'ok' },
  installed: { label: 'Installed', tone: 'neutral' },
  released: { label: 'Released', tone: 'ok' },
  shipped: { label: 'Shipped', tone: 'ok' },
  returned: { label: 'Back from the field', tone: 'hold' },
  scrapped: { label: 'Scrapped', tone: 'bad' },
};

export function itemStatus(status: string): { label: string; tone: Tone } {
  const known = STATUS[status];
  if (known) return known;
  // a state added on the server before the client knows it still reads as words
  const words = status.replace(/_/g, ' ');
  return { label: words.charAt(0).toUpperCase() + words.slice(1), tone: 'neutral' };
}

/** "Cylinder head (left)": the part and, where a family has two, which one. */
export const partName = (kindLabel: string, position: string | null | undefined) =>
  position ? `${kindLabel} (${position})` : kindLabel;
