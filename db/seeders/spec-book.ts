import type { Derivation } from '../../shared/domain/evaluate.js';
import type { PositionScheme } from '../../shared/domain/positions.js';
import type { RuleLimits } from '../../shared/schemas/spec.js';

/**
 * The demo plant's characteristics and its first spec book. ILLUSTRATIVE VALUES ONLY: a plant loads
 * its own engineering specifications. Each rule says where its figure comes from — a published
 * reference, common practice, or from memory — and the demo families are invented, so no value
 * here is any maker's specification.
 */

export type SeedCharacteristic = {
  stage: string;
  code: string;
  name: string;
  kind: 'variable' | 'attribute' | 'derived';
  unit?: string;
  resolution?: number;
  positions: PositionScheme;
  derivation?: Derivation;
  critical?: boolean;
  physical?: [number, number];
  defectCode: string;
  help?: string;
  optional?: boolean;
  /** The purchased part whose size class must match this characteristic's at build. */
  matesWith?: 'pistons' | 'main_bearings' | 'rod_bearings';
};

const once: PositionScheme = { per: 'part' };
const cylinderBore: PositionScheme = {
  per: 'cylinder',
  depths: ['top', 'middle', 'bottom'],
  axes: ['thrust', 'axial'],
};

const cleanCheck = (stage: string, what: string): SeedCharacteristic => ({
  stage,
  code: 'clean',
  name: `Clean: ${what}`,
  kind: 'attribute',
  positions: once,
  defectCode: 'OTHER',
});
const crackCheck = (stage: string, where: string): SeedCharacteristic => ({
  stage,
  code: 'crack-free',
  name: 'No crack indication',
  kind: 'attribute',
  positions: once,
  critical: true,
  defectCode: 'CRK',
  help: `Inspect ${where}. On a fail, say where the indication is.`,
});
const pressureChecks = (stage: string): SeedCharacteristic[] => [
  {
    stage,
    code: 'test-pressure',
    name: 'Test pressure held',
    kind: 'variable',
    unit: 'psi',
    resolution: 1,
    positions: once,
    physical: [0, 150],
    defectCode: 'TEST',
  },
  {
    stage,
    code: 'hold-time',
    name: 'Hold time',
    kind: 'variable',
    unit: 'min',
    resolution: 1,
    positions: once,
    physical: [0, 120],
    defectCode: 'TEST',
  },
  {
    stage,
    code: 'leak-free',
    name: 'No leak or pressure drop',
    kind: 'attribute',
    positions: once,
    critical: true,
    defectCode: 'LEAK',
    help: 'On a fail, say where the leak is.',
  },
];
const deckChecks = (stage: string, what: string): SeedCharacteristic[] => [
  {
    stage,
    code: 'deck-point',
    name: `${what} height at point`,
    kind: 'variable',
    unit: 'in',
    resolution: 0.0001,
    positions: { per: 'deck', points: 6 },
    physical: [-0.05, 0.05],
    defectCode: 'OOT',
    help: 'Indicator reading against the surface plate at the six marked points: corners, and between the bores.',
  },
  {
    stage,
    code: 'deck-flatness',
    name: `${what} flatness`,
    kind: 'derived',
    unit: 'in',
    resolution: 0.0001,
    positions: { per: 'deck' },
    derivation: { fn: 'flatness', of: 'deck-point' },
    defectCode: 'OOT',
  },
  {
    stage,
    code: 'deck-finish',
    name: `${what} surface finish Ra`,
    kind: 'variable',
    unit: 'µin',
    resolution: 1,
    positions: { per: 'deck' },
    physical: [0, 1000],
    defectCode: 'FIN',
  },
];

const TTY_HELP =
  'Torque-to-yield: torque first, then turn the stated angle. These bolts stretch past yield and are never reused.';
const fastener = (
  code: string,
  name: string,
  positions: PositionScheme,
  angle: boolean,
  help = '',
): SeedCharacteristic[] => [
  {
    stage: 'long-block-assembly',
    code: `${code}-torque`,
    name: `${name} torque`,
    kind: 'variable',
    unit: 'lbf·ft',
    resolution: 1,
    positions,
    physical: [0, 400],
    defectCode: 'OOT',
    help: angle ? TTY_HELP : help,
  },
  ...(angle
    ? [
        {
          stage: 'long-block-assembly',
          code: `${code}-angle`,
          name: `${name} angle`,
          kind: 'variable' as const,
          unit: 'deg',
          resolution: 1,
          positions,
          physical: [0, 360] as [number, number],
          defectCode: 'OOT',
          help: TTY_HELP,
        },
      ]
    : []),
];

const ASSEMBLY: SeedCharacteristic[] = [
  {
    stage: 'long-block-assembly',
    code: 'tty-new',
    name: 'Torque-to-yield bolts are new, not reused',
    kind: 'attribute',
    positions: once,
    critical: true,
    defectCode: 'OTHER',
    help: TTY_HELP,
  },
  ...fastener('main-bolt', 'Main cap bolt', { per: 'main' }, true),
  ...fastener('rod-bolt', 'Rod bolt', { per: 'cylinder' }, true),
  ...fastener('head-bolt', 'Head bolt', { per: 'deck' }, true),
  ...fastener('flywheel-bolt', 'Flywheel bolt', once, false),
  ...fastener('rocker-bolt', 'Rocker shaft bolt', once, false),
  ...(['main', 'rod'] as const).flatMap((k): SeedCharacteristic[] => {
    const positions: PositionScheme = k === 'main' ? { per: 'main' } : { per: 'crankpin' };
    const Name = k === 'main' ? 'Main' : 'Rod';
    return [
      {
        stage: 'long-block-assembly',
        code: `${k}-bearing-id`,
        name: `${Name} bearing inside diameter (installed)`,
        kind: 'variable',
        unit: 'in',
        resolution: 0.0001,
        positions,
        physical: [1, 5],
        defectCode: 'OOT',
        help: 'Bore gauge across the installed shells with the caps torqued.',
      },
      {
        stage: 'long-block-assembly',
        code: `${k}-journal-at-fit`,
        name: `${Name} journal diameter at fit`,
        kind: 'variable',
        unit: 'in',
        resolution: 0.0001,
        positions,
        physical: [1, 5],
        defectCode: 'OOT',
      },
      {
        stage: 'long-block-assembly',
        code: `${k}-oil-clearance`,
        name: `${Name} bearing oil clearance`,
        kind: 'derived',
        unit: 'in',
        resolution: 0.0001,
        positions,
        derivation: { fn: 'clearance', outer: `${k}-bearing-id`, inner: `${k}-journal-at-fit` },
        defectCode: 'OOT',
      },
    ];
  }),
  {
    stage: 'long-block-assembly',
    code: 'ring-gap-top',
    name: 'Top ring end gap',
    kind: 'variable',
    unit: 'in',
    resolution: 0.001,
    positions: { per: 'cylinder' },
    physical: [0, 0.1],
    defectCode: 'OOT',
  },
  {
    stage: 'long-block-assembly',
    code: 'ring-gap-second',
    name: 'Second ring end gap',
    kind: 'variable',
    unit: 'in',
    resolution: 0.001,
    positions: { per: 'cylinder' },
    physical: [0, 0.1],
    defectCode: 'OOT',
  },
  {
    stage: 'long-block-assembly',
    code: 'bore-at-fit',
    name: 'Bore at piston fit (middle, thrust)',
    kind: 'variable',
    unit: 'in',
    resolution: 0.0001,
    positions: { per: 'cylinder' },
    physical: [2, 6],
    defectCode: 'OOT',
  },
  {
    stage: 'long-block-assembly',
    code: 'piston-skirt',
    name: 'Piston skirt diameter',
    kind: 'variable',
    unit: 'in',
    resolution: 0.0001,
    positions: { per: 'cylinder' },
    physical: [2, 6],
    defectCode: 'OOT',
  },
  {
    stage: 'long-block-assembly',
    code: 'piston-to-wall',
    name: 'Piston-to-wall clearance',
    kind: 'derived',
    unit: 'in',
    resolution: 0.0001,
    positions: { per: 'cylinder' },
    derivation: { fn: 'clearance', outer: 'bore-at-fit', inner: 'piston-skirt' },
    defectCode: 'OOT',
  },
  {
    stage: 'long-block-assembly',
    code: 'end-play',
    name: 'Crankshaft end play',
    kind: 'variable',
    unit: 'in',
    resolution: 0.001,
    positions: once,
    physical: [0, 0.05],
    defectCode: 'OOT',
  },
  {
    stage: 'long-block-assembly',
    code: 'cam-icl',
    name: 'Intake centreline (degreed in)',
    kind: 'variable',
    unit: 'deg',
    resolution: 0.5,
    positions: once,
    physical: [80, 140],
    defectCode: 'OOT',
    help: 'Degree wheel and dial indicator on the intake lifter: the crank angle of maximum lift.',
  },
  {
    stage: 'long-block-assembly',
    code: 'cam-advance',
    name: 'Cam advance (lobe separation 110° on the card − intake centreline)',
    kind: 'derived',
    unit: 'deg',
    resolution: 0.5,
    positions: once,
    derivation: { fn: 'offset', from: 110, of: 'cam-icl' },
    defectCode: 'OOT',
  },
];

export const CHARACTERISTICS: SeedCharacteristic[] = [
  cleanCheck('block-clean', 'no scale, sludge or blast media'),
  crackCheck('block-crack', 'cylinder walls, decks, main webs and bolt bosses'),
  ...pressureChecks('block-pressure'),
  {
    stage: 'line-hone',
    code: 'main-bore',
    name: 'Main bore diameter',
    kind: 'variable',
    unit: 'in',
    resolution: 0.0001,
    positions: { per: 'main', axes: ['vertical', 'horizontal'] },
    physical: [1, 5],
    defectCode: 'OOT',
  },
  {
    stage: 'line-hone',
    code: 'main-bore-oor',
    name: 'Main bore out-of-round',
    kind: 'derived',
    unit: 'in',
    resolution: 0.0001,
    positions: { per: 'main' },
    derivation: { fn: 'out_of_round', of: 'main-bore' },
    defectCode: 'OOT',
  },
  {
    stage: 'bore-hone',
    code: 'bore',
    name: 'Cylinder bore diameter',
    kind: 'variable',
    unit: 'in',
    resolution: 0.0001,
    positions: cylinderBore,
    physical: [2, 6],
    defectCode: 'OOT',
    matesWith: 'pistons',
    help: 'Dial bore gauge zeroed on the setting ring: top, middle and bottom of ring travel, across (thrust) and along (axial) the crank.',
  },
  {
    stage: 'bore-hone',
    code: 'bore-oor',
    name: 'Bore out-of-round',
    kind: 'derived',
    unit: 'in',
    resolution: 0.0001,
    positions: { per: 'cylinder', depths: ['top', 'middle', 'bottom'] },
    derivation: { fn: 'out_of_round', of: 'bore' },
    defectCode: 'OOT',
  },
  {
    stage: 'bore-hone',
    code: 'bore-taper',
    name: 'Bore taper',
    kind: 'derived',
    unit: 'in',
    resolution: 0.0001,
    positions: { per: 'cylinder' },
    derivation: { fn: 'taper', of: 'bore', top: 'top', bottom: 'bottom' },
    defectCode: 'OOT',
  },
  {
    stage: 'bore-hone',
    code: 'bore-finish',
    name: 'Bore surface finish Ra',
    kind: 'variable',
    unit: 'µin',
    resolution: 1,
    positions: once,
    physical: [0, 500],
    defectCode: 'FIN',
  },
  ...deckChecks('block-deck', 'Deck'),
  cleanCheck('block-final-wash', 'galleries brushed, no chips or grit'),
  cleanCheck('crank-clean', 'oil passages flushed'),
  crackCheck('crank-crack', 'journals, fillets and oil holes'),
  {
    stage: 'crank-grind',
    code: 'main-journal',
    name: 'Main journal diameter',
    kind: 'variable',
    unit: 'in',
    resolution: 0.0001,
    positions: { per: 'main' },
    physical: [1, 5],
    defectCode: 'OOT',
    matesWith: 'main_bearings',
  },
  {
    stage: 'crank-grind',
    code: 'rod-journal',
    name: 'Rod journal diameter',
    kind: 'variable',
    unit: 'in',
    resolution: 0.0001,
    positions: { per: 'crankpin' },
    physical: [1, 4],
    defectCode: 'OOT',
  },
  {
    stage: 'crank-grind',
    code: 'journal-finish',
    name: 'Journal surface finish Ra',
    kind: 'variable',
    unit: 'µin',
    resolution: 1,
    positions: once,
    physical: [0, 200],
    defectCode: 'FIN',
  },
  {
    stage: 'crank-grind',
    code: 'fillets',
    name: 'Fillet radii intact and polished',
    kind: 'attribute',
    positions: once,
    defectCode: 'OOT',
  },
  {
    stage: 'crank-balance',
    code: 'imbalance',
    name: 'Residual imbalance',
    kind: 'variable',
    unit: 'g·in',
    resolution: 0.1,
    positions: { per: 'part' },
    physical: [0, 100],
    defectCode: 'OOT',
  },
  cleanCheck('head-clean', 'no carbon, scale or blast media'),
  crackCheck('head-crack', 'the combustion face, between the seats and around the ports'),
  ...pressureChecks('head-pressure'),
  ...deckChecks('head-deck', 'Head face'),
  {
    stage: 'valve-seats',
    code: 'seat-width-in',
    name: 'Intake seat width',
    kind: 'variable',
    unit: 'in',
    resolution: 0.001,
    positions: { per: 'valve', valves: ['in'] },
    physical: [0, 0.5],
    defectCode: 'OOT',
  },
  {
    stage: 'valve-seats',
    code: 'seat-width-ex',
    name: 'Exhaust seat width',
    kind: 'variable',
    unit: 'in',
    resolution: 0.001,
    positions: { per: 'valve', valves: ['ex'] },
    physical: [0, 0.5],
    defectCode: 'OOT',
  },
  {
    stage: 'valve-seats',
    code: 'seat-runout',
    name: 'Seat runout',
    kind: 'variable',
    unit: 'in',
    resolution: 0.0001,
    positions: { per: 'valve' },
    physical: [0, 0.1],
    defectCode: 'OOT',
  },
  {
    stage: 'valve-seats',
    code: 'three-angle',
    name: 'Three angles cut: 30° top, 45° seat, 60° throat',
    kind: 'attribute',
    positions: once,
    defectCode: 'OOT',
    help: 'A three-angle valve job (common practice).',
  },
  {
    stage: 'head-assembly',
    code: 'port-vacuum',
    name: 'Port vacuum held',
    kind: 'variable',
    unit: 'inHg',
    resolution: 0.5,
    positions: { per: 'valve' },
    physical: [0, 30],
    defectCode: 'LEAK',
    help: 'Vacuum cup on each port with the valve closed; read after the hold time.',
  },
  ...ASSEMBLY,
  {
    stage: 'run-test',
    code: 'oil-pressure-idle',
    name: 'Oil pressure at idle',
    kind: 'variable',
    unit: 'psi',
    resolution: 1,
    positions: once,
    physical: [0, 150],
    critical: true,
    defectCode: 'RUN',
  },
  {
    stage: 'run-test',
    code: 'oil-pressure-2500',
    name: 'Oil pressure at 2500 rpm',
    kind: 'variable',
    unit: 'psi',
    resolution: 1,
    positions: once,
    physical: [0, 150],
    critical: true,
    defectCode: 'RUN',
  },
  {
    stage: 'run-test',
    code: 'compression',
    name: 'Compression',
    kind: 'variable',
    unit: 'psi',
    resolution: 1,
    positions: { per: 'cylinder' },
    physical: [0, 400],
    defectCode: 'RUN',
  },
  {
    stage: 'run-test',
    code: 'compression-spread',
    name: 'Compression spread',
    kind: 'derived',
    unit: '%',
    resolution: 0.1,
    positions: once,
    derivation: { fn: 'spread_pct', of: 'compression' },
    defectCode: 'RUN',
  },
  {
    stage: 'run-test',
    code: 'leak-free',
    name: 'No oil, coolant or fuel leak',
    kind: 'attribute',
    positions: once,
    defectCode: 'LEAK',
  },
  {
    stage: 'run-test',
    code: 'noise-free',
    name: 'No abnormal noise',
    kind: 'attribute',
    positions: once,
    defectCode: 'RUN',
  },
  {
    stage: 'run-test',
    code: 'torque',
    name: 'Torque at the test speed',
    kind: 'variable',
    unit: 'lbf·ft',
    resolution: 1,
    positions: once,
    physical: [0, 2000],
    defectCode: 'RUN',
    optional: true,
    help: 'Only on a stand with a dynamometer.',
  },
  {
    stage: 'run-test',
    code: 'speed',
    name: 'Test speed',
    kind: 'variable',
    unit: 'rpm',
    resolution: 10,
    positions: once,
    physical: [0, 8000],
    defectCode: 'RUN',
    optional: true,
  },
  {
    stage: 'run-test',
    code: 'power',
    name: 'Power (hp = lbf·ft × rpm ÷ 5252)',
    kind: 'derived',
    unit: 'hp',
    resolution: 0.1,
    positions: once,
    derivation: { fn: 'power', torque: 'torque', rpm: 'speed' },
    defectCode: 'RUN',
    optional: true,
  },
  {
    stage: 'final-inspection',
    code: 'visual',
    name: 'Painted, dressed, openings capped',
    kind: 'attribute',
    positions: once,
    defectCode: 'DMG',
  },
];

type Seeded = Omit<RuleLimits, 'sourceNote' | 'sizeClasses'> & {
  sourceNote: string;
  sizeClasses?: RuleLimits['sizeClasses'];
};
const nominal = (n: number, tol: number, resolution: number, sourceNote: string): Seeded => ({
  limitType: 'nominal',
  nominal: n,
  minusTol: tol,
  plusTol: tol,
  lowerLimit: null,
  upperLimit: null,
  resolution,
  sourceNote,
});
const range = (lo: number, hi: number, resolution: number, sourceNote: string): Seeded => ({
  limitType: 'range',
  nominal: null,
  minusTol: null,
  plusTol: null,
  lowerLimit: lo,
  upperLimit: hi,
  resolution,
  sourceNote,
});
const atLeast = (lo: number, resolution: number, sourceNote: string): Seeded => ({
  ...range(lo, 0, resolution, sourceNote),
  limitType: 'min',
  upperLimit: null,
});
const atMost = (hi: number, resolution: number, sourceNote: string): Seeded => ({
  ...range(0, hi, resolution, sourceNote),
  limitType: 'max',
  lowerLimit: null,
});

const SERVICE_MANUAL = 'Service-manual figure quoted in the project brief (illustrative)';
const MEMORY = 'From memory; illustrative demo value';

/** Rules shared by both demo families, keyed `stage/characteristic`. */
const COMMON: Record<string, Seeded> = {
  'block-pressure/test-pressure': atLeast(40, 1, 'Shop air test of water jackets; from memory'),
  'block-pressure/hold-time': atLeast(10, 1, MEMORY),
  'line-hone/main-bore-oor': atMost(0.0005, 0.0001, MEMORY),
  'bore-hone/bore-oor': atMost(0.001, 0.0001, `${SERVICE_MANUAL}: out-of-round ≤ 0.001 in (production)`),
  'bore-hone/bore-taper': atMost(0.001, 0.0001, `${SERVICE_MANUAL}: taper 0.0005–0.001 in`),
  'bore-hone/bore-finish': range(15, 35, 1, 'Plateau hone for moly rings; from memory'),
  'block-deck/deck-point': range(-0.01, 0.01, 0.0001, 'Indicator range only; flatness is the judged figure'),
  'block-deck/deck-flatness': atMost(0.004, 0.0001, 'Reconditioning guide quoted in the brief: 0.004 in overall'),
  'block-deck/deck-finish': range(60, 100, 1, 'Composite gasket 60–100 µin Ra; trade references (sources conflict)'),
  'crank-grind/journal-finish': atMost(15, 1, MEMORY),
  'crank-balance/imbalance': atMost(0.5, 0.1, MEMORY),
  'head-pressure/test-pressure': atLeast(40, 1, 'Shop air test of water jackets; from memory'),
  'head-pressure/hold-time': atLeast(10, 1, MEMORY),
  'head-deck/deck-point': range(-0.01, 0.01, 0.0001, 'Indicator range only; flatness is the judged figure'),
  'head-deck/deck-flatness': atMost(0.004, 0.0001, 'Reconditioning guide quoted in the brief: 0.004 in overall'),
  'head-deck/deck-finish': range(60, 100, 1, 'Composite gasket 60–100 µin Ra; trade references (sources conflict)'),
  'valve-seats/seat-width-in': range(0.04, 0.06, 0.001, MEMORY),
  'valve-seats/seat-width-ex': range(0.06, 0.08, 0.001, MEMORY),
  'valve-seats/seat-runout': atMost(0.002, 0.0001, MEMORY),
  'head-assembly/port-vacuum': atLeast(18, 0.5, MEMORY),
  'run-test/oil-pressure-idle': atLeast(10, 1, 'About 10 psi per 1000 rpm; common practice'),
  'run-test/oil-pressure-2500': atLeast(25, 1, 'About 10 psi per 1000 rpm; common practice'),
  'run-test/compression': atLeast(120, 1, MEMORY),
  'run-test/compression-spread': atMost(10, 0.1, 'Within 10 % — common shop rule (brief: rules of thumb)'),
  'run-test/torque': atLeast(0, 1, 'Recorded, not judged: any positive torque'),
  'run-test/speed': range(1000, 3000, 10, 'The cell runs the engine between 1000 and 3000 rpm; from memory'),
  'run-test/power': atLeast(50, 0.1, 'Illustrative floor for a warm engine at part throttle; from memory'),
  'long-block-assembly/main-bolt-torque': nominal(37, 2, 1, 'Torque-to-yield: 37 lbf·ft then 140° (common practice)'),
  'long-block-assembly/main-bolt-angle': nominal(140, 5, 1, 'Torque-to-yield: 37 lbf·ft then 140° (common practice)'),
  'long-block-assembly/rod-bolt-torque': nominal(20, 2, 1, MEMORY),
  'long-block-assembly/rod-bolt-angle': nominal(70, 5, 1, MEMORY),
  'long-block-assembly/head-bolt-torque': nominal(22, 2, 1, MEMORY),
  'long-block-assembly/head-bolt-angle': nominal(180, 5, 1, MEMORY),
  'long-block-assembly/flywheel-bolt-torque': nominal(85, 2, 1, 'Flywheel bolts 85 lbf·ft (common practice)'),
  'long-block-assembly/rocker-bolt-torque': nominal(22, 1, 1, 'Rocker shaft bolts 22 lbf·ft (common practice)'),
  'long-block-assembly/rod-oil-clearance': range(0.0015, 0.0025, 0.0001, MEMORY),
  'long-block-assembly/end-play': range(0.002, 0.008, 0.001, MEMORY),
  'long-block-assembly/piston-to-wall': range(0.0015, 0.0025, 0.0001, MEMORY),
  'long-block-assembly/cam-icl': nominal(
    106,
    1,
    0.5,
    'Cam card: 110° lobe separation, installed 4° advanced (106° ICL)',
  ),
  'long-block-assembly/cam-advance': nominal(4, 1, 0.5, 'Advance = LSA − ICL (common practice): 110 − 106 = 4°'),
};

/**
 * Size classes in inch steps from a standard size, each ±tol (over for bores, under for journals;
 * the steps are the trade's usual 0.010 in ones, common practice).
 */
const inchSteps = (standard: number, steps: number[], sign: 1 | -1, tol: number) =>
  [0, ...steps].map((step) => ({
    code: step === 0 ? 'STD' : `${sign > 0 ? '+' : '-'}${step.toFixed(3)}`,
    name: step === 0 ? 'Standard' : `${step.toFixed(3)} in ${sign > 0 ? 'over' : 'under'}`,
    nominal: Number((standard + sign * step).toFixed(4)),
    minusTol: tol,
    plusTol: tol,
  }));

/**
 * Family-specific sizes. Corrie V8: 4.000 in bore bored 0.030 in over; Tarn six: 94 mm
 * (3.7008 in) bored 0.5 mm (0.0197 in) over. Journals and housings are round invented sizes.
 */
const BY_FAMILY: Record<string, Record<string, Seeded>> = {
  'CORRIE-8': {
    'long-block-assembly/main-bearing-id': nominal(
      2.4511,
      0.0003,
      0.0001,
      `Invented shell for the 2.449 in journal; ${MEMORY}`,
    ),
    'long-block-assembly/main-journal-at-fit': nominal(2.449, 0.0005, 0.0001, 'As ground at crank grind'),
    'long-block-assembly/rod-bearing-id': nominal(
      2.101,
      0.0003,
      0.0001,
      `Invented shell for the 2.099 in journal; ${MEMORY}`,
    ),
    'long-block-assembly/rod-journal-at-fit': nominal(2.099, 0.0005, 0.0001, 'As ground at crank grind'),
    // 0.00075–0.0010 in per inch of a 2.449 in journal (bearing maker's rule of thumb, common practice)
    'long-block-assembly/main-oil-clearance': range(
      0.0018,
      0.0025,
      0.0001,
      'Rule of thumb 0.00075–0.0010 in per inch of journal (common practice)',
    ),
    // top ring: bore × 0.0045 in/in = 4.030 × 0.0045 ≈ 0.018 in; second ≈ 1.25 × top (ring maker's guidance)
    'long-block-assembly/ring-gap-top': range(
      0.016,
      0.022,
      0.001,
      'Bore × 0.0045 in/in ≈ 0.018 in (ring maker guidance, common practice)',
    ),
    'long-block-assembly/ring-gap-second': range(
      0.02,
      0.027,
      0.001,
      'About 1.25 × the top gap (ring maker guidance, common practice)',
    ),
    'long-block-assembly/bore-at-fit': nominal(4.03, 0.0005, 0.0001, 'As finished at bore and hone'),
    'long-block-assembly/piston-skirt': nominal(
      4.028,
      0.0005,
      0.0001,
      `Invented piston for the 0.030 in oversize; ${MEMORY}`,
    ),
    'bore-hone/bore': {
      ...nominal(4.03, 0.0005, 0.0001, 'Invented family: 4.000 in + 0.030 in oversize; ±0.0005 in from memory'),
      sizeClasses: inchSteps(4, [0.01, 0.02, 0.03], 1, 0.0005),
    },
    'line-hone/main-bore': nominal(2.6415, 0.0005, 0.0001, `Invented housing size; ${MEMORY}`),
    'crank-grind/main-journal': {
      ...nominal(2.449, 0.0005, 0.0001, `Invented journal, 0.010 in under; ${MEMORY}`),
      sizeClasses: inchSteps(2.459, [0.01, 0.02, 0.03], -1, 0.0005),
    },
    'crank-grind/rod-journal': nominal(2.099, 0.0005, 0.0001, `Invented journal, 0.010 in under; ${MEMORY}`),
  },
  'TARN-6': {
    'long-block-assembly/main-bearing-id': nominal(
      2.3711,
      0.0003,
      0.0001,
      `Invented shell for the 2.369 in journal; ${MEMORY}`,
    ),
    'long-block-assembly/main-journal-at-fit': nominal(2.369, 0.0005, 0.0001, 'As ground at crank grind'),
    'long-block-assembly/rod-bearing-id': nominal(
      2.091,
      0.0003,
      0.0001,
      `Invented shell for the 2.089 in journal; ${MEMORY}`,
    ),
    'long-block-assembly/rod-journal-at-fit': nominal(2.089, 0.0005, 0.0001, 'As ground at crank grind'),
    'long-block-assembly/main-oil-clearance': range(
      0.0018,
      0.0024,
      0.0001,
      'Rule of thumb 0.00075–0.0010 in per inch of journal (common practice)',
    ),
    'long-block-assembly/ring-gap-top': range(
      0.015,
      0.02,
      0.001,
      'Bore × 0.0045 in/in ≈ 0.0167 in (ring maker guidance, common practice)',
    ),
    'long-block-assembly/ring-gap-second': range(
      0.018,
      0.025,
      0.001,
      'About 1.25 × the top gap (ring maker guidance, common practice)',
    ),
    'long-block-assembly/bore-at-fit': nominal(3.7205, 0.0005, 0.0001, 'As finished at bore and hone'),
    'long-block-assembly/piston-skirt': nominal(
      3.7185,
      0.0005,
      0.0001,
      `Invented piston for the 0.5 mm oversize; ${MEMORY}`,
    ),
    'bore-hone/bore': {
      ...nominal(
        3.7205,
        0.0005,
        0.0001,
        'Invented family: 94 mm + 0.5 mm oversize = 3.7205 in; ±0.0005 in from memory',
      ),
      // metric steps in the rule's inches, 1 in = 25.4 mm exactly (NIST SP 811): 94.00, 94.25, 94.50 mm
      sizeClasses: [
        { code: 'STD', name: 'Standard (94.00 mm)', nominal: 3.7008, minusTol: 0.0005, plusTol: 0.0005 },
        { code: '+0.25', name: '0.25 mm over (94.25 mm)', nominal: 3.7106, minusTol: 0.0005, plusTol: 0.0005 },
        { code: '+0.50', name: '0.50 mm over (94.50 mm)', nominal: 3.7205, minusTol: 0.0005, plusTol: 0.0005 },
      ],
    },
    'line-hone/main-bore': nominal(2.5615, 0.0005, 0.0001, `Invented housing size; ${MEMORY}`),
    'crank-grind/main-journal': {
      ...nominal(2.369, 0.0005, 0.0001, `Invented journal, 0.010 in under; ${MEMORY}`),
      sizeClasses: inchSteps(2.379, [0.01, 0.02], -1, 0.0005),
    },
    'crank-grind/rod-journal': nominal(2.089, 0.0005, 0.0001, `Invented journal, 0.010 in under; ${MEMORY}`),
  },
};

/** The first version of every rule for a family, keyed `stage/characteristic`. */
export function firstRules(familyCode: string): Record<string, Seeded> {
  return { ...COMMON, ...(BY_FAMILY[familyCode] ?? {}) };
}
