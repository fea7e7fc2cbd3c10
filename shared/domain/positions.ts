/**
 * Where on a part a characteristic is taken. A characteristic stores a scheme ("per cylinder, at
 * three depths and two axes"); the scheme is expanded for one item of one engine family into the
 * concrete positions a station form shows and a submission must fill.
 *
 * Position codes are segments joined by "/": `c3/top/thrust`, `m2/vertical`, `c5/ex`, `deck-l/p4`.
 * A derived characteristic's position is a prefix of the positions it is computed from (the
 * out-of-round at `c3/top` comes from `c3/top/thrust` and `c3/top/axial`).
 */
export type PositionScheme =
  | { per: 'part' }
  | { per: 'cylinder'; depths?: string[]; axes?: string[] }
  | { per: 'main'; axes?: string[] }
  | { per: 'crankpin' }
  | { per: 'valve'; valves?: ('in' | 'ex')[] }
  | { per: 'deck'; points?: number };

export type FamilyShape = { layout: 'inline' | 'v'; cylinders: number; headsPerEngine: number };
export type ItemShape = { kind: string; positionLabel: string | null };

export type Position = {
  code: string;
  label: string;
  /** The part of the layout it belongs to: a bank, a deck, a main bore … (empty when there is one). */
  group: string;
  cylinder?: number;
  depth?: string;
  axis?: string;
};

export const BANK_LABEL = { left: 'Left bank', right: 'Right bank' } as const;

/**
 * Coretrail's cylinder numbering for V engines: the left bank holds 1…n/2 and the right bank the
 * rest, seen from the flywheel end. A plant whose engines number otherwise changes only this.
 */
export function bankOf(family: FamilyShape, cylinder: number): 'left' | 'right' | null {
  if (family.layout !== 'v') return null;
  return cylinder <= family.cylinders / 2 ? 'left' : 'right';
}

/**
 * Main bearings: an inline engine has one more than its cylinders, a 90° V one more than half
 * (common practice; true of both demo families). Crankpins: one per cylinder inline, one per pair
 * on a V whose rods share a pin.
 */
export const mainBearingsOf = (f: FamilyShape) => (f.layout === 'v' ? f.cylinders / 2 + 1 : f.cylinders + 1);
export const crankpinsOf = (f: FamilyShape) => (f.layout === 'v' ? f.cylinders / 2 : f.cylinders);

/** The cylinders a part spans: a head of a V covers its own bank only. */
export function cylindersOf(family: FamilyShape, item: ItemShape): number[] {
  const all = Array.from({ length: family.cylinders }, (_, i) => i + 1);
  if (item.kind === 'cylinder_head' && family.layout === 'v') {
    const side = item.positionLabel === 'right' ? 'right' : 'left';
    return all.filter((c) => bankOf(family, c) === side);
  }
  return all;
}

const DEPTH_LABEL: Record<string, string> = { top: 'top', middle: 'middle', bottom: 'bottom' };
const VALVE_LABEL = { in: 'intake', ex: 'exhaust' } as const;
const cap = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);

function cylinderGroup(family: FamilyShape, c: number) {
  const bank = bankOf(family, c);
  return bank ? BANK_LABEL[bank] : '';
}

function decksOf(family: FamilyShape, item: ItemShape): { code: string; label: string }[] {
  if ((item.kind === 'block' || item.kind === 'long_block') && family.layout === 'v') {
    return [
      { code: 'deck-l', label: 'Left deck' },
      { code: 'deck-r', label: 'Right deck' },
    ];
  }
  return [{ code: 'deck', label: item.kind === 'cylinder_head' ? 'Head face' : 'Deck' }];
}

/** Every position a scheme asks for on this item, in the order a form lays them out. */
export function expandPositions(scheme: PositionScheme, family: FamilyShape, item: ItemShape): Position[] {
  switch (scheme.per) {
    case 'part':
      return [{ code: '', label: 'Whole part', group: '' }];
    case 'cylinder': {
      const out: Position[] = [];
      for (const c of cylindersOf(family, item)) {
        const group = cylinderGroup(family, c);
        const depths = scheme.depths?.length ? scheme.depths : [null];
        const axes = scheme.axes?.length ? scheme.axes : [null];
        for (const depth of depths) {
          for (const axis of axes) {
            const code = [`c${c}`, depth, axis].filter(Boolean).join('/');
            const label = [`Cylinder ${c}`, depth && DEPTH_LABEL[depth], axis].filter(Boolean).join(', ');
            out.push({ code, label, group, cylinder: c, ...(depth && { depth }), ...(axis && { axis }) });
          }
        }
      }
      return out;
    }
    case 'main': {
      const out: Position[] = [];
      for (let m = 1; m <= mainBearingsOf(family); m++) {
        const axes = scheme.axes?.length ? scheme.axes : [null];
        for (const axis of axes) {
          out.push({
            code: [`m${m}`, axis].filter(Boolean).join('/'),
            label: [`Main ${m}`, axis].filter(Boolean).join(', '),
            group: `Main ${m}`,
            ...(axis && { axis }),
          });
        }
      }
      return out;
    }
    case 'crankpin':
      return Array.from({ length: crankpinsOf(family) }, (_, i) => ({
        code: `r${i + 1}`,
        label: `Rod journal ${i + 1}`,
        group: '',
      }));
    case 'valve': {
      const valves = scheme.valves?.length ? scheme.valves : (['in', 'ex'] as const);
      return cylindersOf(family, item).flatMap((c) =>
        valves.map((v) => ({
          code: `c${c}/${v}`,
          label: `Cylinder ${c} ${VALVE_LABEL[v]}`,
          group: `Cylinder ${c}`,
          cylinder: c,
        })),
      );
    }
    case 'deck': {
      const points = scheme.points ?? 0;
      return decksOf(family, item).flatMap((d) =>
        points
          ? Array.from({ length: points }, (_, i) => ({
              code: `${d.code}/p${i + 1}`,
              label: `${d.label}, point ${i + 1}`,
              group: d.label,
            }))
          : [{ code: d.code, label: d.label, group: d.label }],
      );
    }
  }
}

/** A readable name for a position code, for places that have only the code (NCRs, the trail). */
export function describePosition(code: string): string {
  if (!code) return 'whole part';
  return code
    .split('/')
    .map((seg) => {
      let m = /^c(\d+)$/.exec(seg);
      if (m) return `cylinder ${m[1]}`;
      m = /^m(\d+)$/.exec(seg);
      if (m) return `main ${m[1]}`;
      m = /^r(\d+)$/.exec(seg);
      if (m) return `rod journal ${m[1]}`;
      m = /^p(\d+)$/.exec(seg);
      if (m) return `point ${m[1]}`;
      if (seg === 'in' || seg === 'ex') return VALVE_LABEL[seg];
      if (seg === 'deck-l') return 'left deck';
      if (seg === 'deck-r') return 'right deck';
      return seg;
    })
    .join(', ')
    .replace(/^./, (c) => cap(c));
}
