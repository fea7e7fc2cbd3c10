import type { FormCharacteristic, Position } from '../../api/station/types';
import type { Slot } from './readings';
import { t } from '../../lib/i18n';
import { positionWord } from '../../lib/position-words';

/**
 * How a characteristic's positions are laid out on the screen, like the part on the bench: banks
 * side by side with a card per cylinder (depth rows × axis columns), a card per main bore or deck,
 * or a plain row of boxes. Derived values sit in the card they are worked out from.
 */

export type DerivedCell = { char: FormCharacteristic; position: Position };

export type CylinderCard = {
  cylinder: number;
  label: string;
  depths: string[];
  axes: string[];
  cell: (depth: string, axis: string) => Slot | undefined;
  /** Derived values per depth row (out-of-round at the top …), keyed by depth. */
  rowDerived: Map<string, DerivedCell[]>;
  /** Derived values of the whole cylinder (taper). */
  derived: DerivedCell[];
};

export type GroupCard = { label: string; slots: Slot[]; derived: DerivedCell[] };

export type Layout =
  | { kind: 'banks'; banks: { label: string; cards: CylinderCard[] }[]; derived: DerivedCell[] }
  | { kind: 'groups'; cards: GroupCard[]; derived: DerivedCell[] }
  | { kind: 'row'; slots: Slot[]; derived: DerivedCell[] };

export type Section = {
  char: FormCharacteristic;
  /** Derived characteristics shown inside this section. */
  companions: FormCharacteristic[];
  layout: Layout | null;
};

const uniq = <T>(xs: T[]) => [...new Set(xs)];
const under = (prefix: string, code: string) => prefix === '' || code === prefix || code.startsWith(`${prefix}/`);

/** The characteristic a derived one is worked out from, when there is exactly one. */
function sourceOf(d: FormCharacteristic): string | null {
  return d.derivation && 'of' in d.derivation ? d.derivation.of : null;
}

function groupsInOrder<T>(items: T[], key: (t: T) => string): [string, T[]][] {
  const m = new Map<string, T[]>();
  for (const it of items) {
    const k = key(it);
    if (!m.has(k)) m.set(k, []);
    m.get(k)!.push(it);
  }
  return [...m.entries()];
}

function banksLayout(slots: Slot[], derived: DerivedCell[]): Layout {
  const placed = new Set<DerivedCell>();
  const banks = groupsInOrder(slots, (s) => s.position.group).map(([label, inBank]) => ({
    label,
    cards: groupsInOrder(inBank, (s) => String(s.position.cylinder)).map(([, inCyl]): CylinderCard => {
      const cylinder = inCyl[0]!.position.cylinder!;
      const prefix = inCyl[0]!.position.code.split('/')[0]!;
      const mine = derived.filter((d) => d.position.cylinder === cylinder && under(prefix, d.position.code));
      mine.forEach((d) => placed.add(d));
      const rowDerived = new Map<string, DerivedCell[]>();
      for (const d of mine.filter((x) => x.position.depth)) {
        const row = rowDerived.get(d.position.depth!) ?? [];
        row.push(d);
        rowDerived.set(d.position.depth!, row);
      }
      return {
        cylinder,
        label: t('pos.cylinder', { n: cylinder }),
        depths: uniq(inCyl.map((s) => s.position.depth ?? '')),
        axes: uniq(inCyl.map((s) => s.position.axis ?? '')),
        cell: (depth, axis) =>
          inCyl.find((s) => (s.position.depth ?? '') === depth && (s.position.axis ?? '') === axis),
        rowDerived,
        derived: mine.filter((x) => !x.position.depth),
      };
    }),
  }));
  return { kind: 'banks', banks, derived: derived.filter((d) => !placed.has(d)) };
}

function groupsLayout(slots: Slot[], derived: DerivedCell[]): Layout {
  const placed = new Set<DerivedCell>();
  const cards = groupsInOrder(slots, (s) => s.position.group).map(([label, inGroup]): GroupCard => {
    const mine = derived.filter(
      (d) => d.position.code !== '' && inGroup.some((s) => under(d.position.code, s.position.code)),
    );
    mine.forEach((d) => placed.add(d));
    return { label, slots: inGroup, derived: mine };
  });
  return { kind: 'groups', cards, derived: derived.filter((d) => !placed.has(d)) };
}

function layoutOf(slots: Slot[], derived: DerivedCell[]): Layout {
  const ps = slots.map((s) => s.position);
  if (ps.length > 1 && ps.every((p) => p.cylinder && (p.depth || p.axis))) return banksLayout(slots, derived);
  const sizes = groupsInOrder(ps, (p) => p.group).map(([, g]) => g.length);
  if (ps.every((p) => p.group) && sizes.some((n) => n > 1)) return groupsLayout(slots, derived);
  return { kind: 'row', slots, derived };
}

/** The form in sections: each typed characteristic with the derived ones worked out from it. */
export function sectionsOf(characteristics: FormCharacteristic[], slots: Slot[]): Section[] {
  const typed = characteristics.filter((c) => c.kind !== 'derived');
  const companionsOf = new Map<string, FormCharacteristic[]>();
  const alone: FormCharacteristic[] = [];
  for (const d of characteristics.filter((c) => c.kind === 'derived')) {
    const src = sourceOf(d);
    if (src && typed.some((c) => c.code === src && c.kind === 'variable')) {
      companionsOf.set(src, [...(companionsOf.get(src) ?? []), d]);
    } else alone.push(d);
  }
  const sections: Section[] = typed.map((char) => {
    const companions = companionsOf.get(char.code) ?? [];
    const derived = companions.flatMap((c) => c.positions.map((position) => ({ char: c, position })));
    const mine = slots.filter((s) => s.char.code === char.code);
    return { char, companions, layout: char.kind === 'variable' ? layoutOf(mine, derived) : null };
  });
  for (const d of alone) {
    sections.push({
      char: d,
      companions: [],
      layout: { kind: 'row', slots: [], derived: d.positions.map((position) => ({ char: d, position })) },
    });
  }
  return sections;
}

const cap = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);

/** A position's label without its card's name: "Left deck, point 3" in the Left deck card is "Point 3". */
export function shortLabel(position: Position, within: string): string {
  if (!within || !position.label.startsWith(within)) return position.label;
  const rest = position.label
    .slice(within.length)
    .replace(/^[,\s]+/, '')
    .trim();
  return rest ? cap(rest) : position.label;
}

export const headerOf = (s: string) => positionWord(s);

/**
 * A derived characteristic's name inside its source's card, without the words they share:
 * "Bore out-of-round" under "Cylinder bore diameter" is "Out-of-round".
 */
export function shortName(derived: FormCharacteristic, source: FormCharacteristic): string {
  const shared = new Set(source.name.toLowerCase().split(/\s+/));
  const words = derived.name.split(/\s+/);
  let i = 0;
  while (i < words.length - 1 && shared.has(words[i]!.toLowerCase())) i++;
  return cap(words.slice(i).join(' '));
}
