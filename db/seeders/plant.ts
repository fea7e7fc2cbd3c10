import type { PartKind } from '../../shared/schemas/reference.js';
import type { Role } from '../../shared/roles.js';

/**
 * The demo plant. Everything here is invented: the plant, its engine families, people, customers
 * and suppliers. Dimensions are plausible round numbers, not any maker's specification.
 */
export const PLANT = {
  name: 'Larkspur Valley Engine Works',
  town: 'Larkspur Valley',
  address: '1400 Foundry Road, Larkspur Valley',
  // the plant's calendar: ship dates, due dates and warranty days are its days
  timeZone: 'America/Chicago',
};

export const DEMO_USERS: { role: Role; email: string; name: string; password: string }[] = [
  { role: 'admin', email: 'admin@larkspur.example', name: 'Ada Whitcombe', password: 'admin-coretrail-demo' },
  {
    role: 'receiving',
    email: 'receiving@larkspur.example',
    name: 'Ravi Okonkwo-Lind',
    password: 'receiving-coretrail-demo',
  },
  { role: 'operator', email: 'operator@larkspur.example', name: 'Otto Brannigan', password: 'operator-coretrail-demo' },
  { role: 'quality', email: 'quality@larkspur.example', name: 'Quinn Ashdown', password: 'quality-coretrail-demo' },
  // a second quality engineer: a rule is approved, and a critical use-as-is countersigned, by someone else
  {
    role: 'quality',
    email: 'quality2@larkspur.example',
    name: 'Petra Lindqvist',
    password: 'quality2-coretrail-demo',
  },
  {
    role: 'supervisor',
    email: 'supervisor@larkspur.example',
    name: 'Suki Marwood',
    password: 'supervisor-coretrail-demo',
  },
  { role: 'shipping', email: 'shipping@larkspur.example', name: 'Shay Pellworth', password: 'shipping-coretrail-demo' },
  { role: 'warranty', email: 'warranty@larkspur.example', name: 'Wren Halloway', password: 'warranty-coretrail-demo' },
];

export const FAMILIES = [
  {
    code: 'TARN-6',
    name: 'Tarn inline six',
    description: 'Invented 4.2 L inline six for light trucks; one cast-iron head, seven main bearings.',
    layout: 'inline' as const,
    cylinders: 6,
    boreMm: 94,
    strokeMm: 101,
    headsPerEngine: 1,
    warrantyMonths: 24,
    warrantyKm: 100_000,
  },
  {
    code: 'CORRIE-8',
    name: 'Corrie V8',
    description: 'Invented 5.97 L pushrod V8 (4.000 in bore × 3.622 in stroke); two heads, five main bearings.',
    layout: 'v' as const,
    cylinders: 8,
    boreMm: 101.6,
    strokeMm: 92,
    headsPerEngine: 2,
    warrantyMonths: 36,
    warrantyKm: 160_000,
  },
];

const HAZARD = {
  crack:
    'Magnetic particle inspection uses strong magnetic fields, UV-A lamps and carrier chemicals. Follow the plant procedure and wear the protection it names.',
  pressure:
    'Pressure testing stores energy in compressed air or hot water. Plug and clamp as the plant procedure says; stand clear while the part is pressurised.',
  machining:
    "Rotating cutters and hones. Guards closed, no gloves near rotating spindles, follow the machine's own operating procedure.",
  lifting: 'Heavy assembly: use the hoist and lifting points the plant procedure names.',
  teardown:
    'Heavy parts and stored fluids: lift the block, crankshaft and heads with the hoist and lifting points the plant procedure names; drain oil and coolant first.',
  run: 'A running engine: rotating parts, hot exhaust, carbon monoxide and fuel. Follow the test cell procedure and local codes.',
};

export const STAGES: {
  code: string;
  name: string;
  partKind: PartKind;
  hazard: string | null;
  description: string;
  /** The unit's run test, which the release gate requires passed. */
  runTest?: boolean;
}[] = [
  {
    code: 'intake',
    name: 'Intake',
    partKind: 'core',
    hazard: null,
    description: 'Core received, identified and graded at the dock.',
  },
  {
    code: 'teardown',
    name: 'Teardown',
    partKind: 'core',
    hazard: HAZARD.teardown,
    description: 'Core split into serialized major parts; wear parts discarded.',
  },
  {
    code: 'block-clean',
    name: 'Block clean',
    partKind: 'block',
    hazard: null,
    description: 'Thermal or chemical clean and shot blast.',
  },
  {
    code: 'block-crack',
    name: 'Block crack test',
    partKind: 'block',
    hazard: HAZARD.crack,
    description: 'Magnetic particle inspection of bores, decks and main webs.',
  },
  {
    code: 'block-pressure',
    name: 'Block pressure test',
    partKind: 'block',
    hazard: HAZARD.pressure,
    description: 'Water jacket and oil galleries held under pressure.',
  },
  {
    code: 'line-hone',
    name: 'Line hone',
    partKind: 'block',
    hazard: HAZARD.machining,
    description: 'Main bores honed to size and alignment.',
  },
  {
    code: 'bore-hone',
    name: 'Bore and hone',
    partKind: 'block',
    hazard: HAZARD.machining,
    description: 'Cylinders bored to oversize and honed to finish.',
  },
  {
    code: 'block-deck',
    name: 'Block deck resurface',
    partKind: 'block',
    hazard: HAZARD.machining,
    description: 'Deck faces milled flat to finish.',
  },
  {
    code: 'block-final-wash',
    name: 'Block final wash',
    partKind: 'block',
    hazard: null,
    description: 'Galleries brushed and washed before assembly.',
  },
  {
    code: 'crank-clean',
    name: 'Crankshaft clean',
    partKind: 'crankshaft',
    hazard: null,
    description: 'Cleaned and oil passages flushed.',
  },
  {
    code: 'crank-crack',
    name: 'Crankshaft crack test',
    partKind: 'crankshaft',
    hazard: HAZARD.crack,
    description: 'Magnetic particle inspection of journals and fillets.',
  },
  {
    code: 'crank-grind',
    name: 'Crankshaft grind and polish',
    partKind: 'crankshaft',
    hazard: HAZARD.machining,
    description: 'Journals ground to undersize and polished.',
  },
  {
    code: 'crank-balance',
    name: 'Crankshaft balance',
    partKind: 'crankshaft',
    hazard: HAZARD.machining,
    description: 'Dynamic balance, where the family calls for it.',
  },
  {
    code: 'head-clean',
    name: 'Head clean',
    partKind: 'cylinder_head',
    hazard: null,
    description: 'Cleaned and shot blast.',
  },
  {
    code: 'head-crack',
    name: 'Head crack test',
    partKind: 'cylinder_head',
    hazard: HAZARD.crack,
    description: 'Magnetic particle inspection or dye check of the combustion face.',
  },
  {
    code: 'head-pressure',
    name: 'Head pressure test',
    partKind: 'cylinder_head',
    hazard: HAZARD.pressure,
    description: 'Water jacket held under pressure.',
  },
  {
    code: 'head-deck',
    name: 'Head deck resurface',
    partKind: 'cylinder_head',
    hazard: HAZARD.machining,
    description: 'Combustion face milled flat to finish.',
  },
  {
    code: 'valve-seats',
    name: 'Valve seat work',
    partKind: 'cylinder_head',
    hazard: HAZARD.machining,
    description: 'Three-angle seats cut: top, seat and throat.',
  },
  {
    code: 'head-assembly',
    name: 'Head assembly and vacuum test',
    partKind: 'cylinder_head',
    hazard: null,
    description: 'Valves, springs and seals fitted; each port vacuum tested.',
  },
  {
    code: 'long-block-assembly',
    name: 'Long block assembly',
    partKind: 'long_block',
    hazard: HAZARD.lifting,
    description: 'Block, crankshaft, heads and new parts assembled; torques and clearances recorded.',
  },
  {
    code: 'run-test',
    name: 'Run test',
    partKind: 'long_block',
    hazard: HAZARD.run,
    runTest: true,
    description: 'Engine run on the test stand: oil pressure, compression, leaks, noise.',
  },
  {
    code: 'final-inspection',
    name: 'Final inspection',
    partKind: 'long_block',
    hazard: null,
    description: 'Visual check, paint, dress and pack.',
  },
];

export const ROUTES: Record<Exclude<PartKind, 'camshaft' | 'rod_set'>, { stage: string; required: boolean }[]> = {
  core: [
    { stage: 'intake', required: true },
    { stage: 'teardown', required: true },
  ],
  block: [
    'block-clean',
    'block-crack',
    'block-pressure',
    'line-hone',
    'bore-hone',
    'block-deck',
    'block-final-wash',
  ].map((stage) => ({ stage, required: true })),
  crankshaft: [
    { stage: 'crank-clean', required: true },
    { stage: 'crank-crack', required: true },
    { stage: 'crank-grind', required: true },
    { stage: 'crank-balance', required: false },
  ],
  cylinder_head: ['head-clean', 'head-crack', 'head-pressure', 'head-deck', 'valve-seats', 'head-assembly'].map(
    (stage) => ({ stage, required: true }),
  ),
  long_block: ['long-block-assembly', 'run-test', 'final-inspection'].map((stage) => ({ stage, required: true })),
};

export const STATIONS = [
  { code: 'DOCK-1', name: 'Receiving dock', stage: 'intake', location: 'Bay A' },
  { code: 'TD-1', name: 'Teardown bench', stage: 'teardown', location: 'Bay A' },
  { code: 'CLN-1', name: 'Block thermal clean', stage: 'block-clean', location: 'Bay B' },
  { code: 'MPI-1', name: 'Crack test booth', stage: 'block-crack', location: 'Bay B' },
  { code: 'PT-1', name: 'Pressure test tank', stage: 'block-pressure', location: 'Bay B' },
  { code: 'LH-1', name: 'Line hone', stage: 'line-hone', location: 'Machine shop' },
  { code: 'BH-1', name: 'Bore and hone cell', stage: 'bore-hone', location: 'Machine shop' },
  { code: 'DK-1', name: 'Deck mill', stage: 'block-deck', location: 'Machine shop' },
  { code: 'WSH-1', name: 'Block final wash', stage: 'block-final-wash', location: 'Machine shop' },
  { code: 'CLN-2', name: 'Crankshaft wash', stage: 'crank-clean', location: 'Bay B' },
  { code: 'MPI-2', name: 'Crankshaft crack test', stage: 'crank-crack', location: 'Bay B' },
  { code: 'CG-1', name: 'Crank grinder', stage: 'crank-grind', location: 'Machine shop' },
  { code: 'BAL-1', name: 'Crankshaft balancer', stage: 'crank-balance', location: 'Machine shop' },
  { code: 'CLN-3', name: 'Head clean', stage: 'head-clean', location: 'Head shop' },
  { code: 'MPI-3', name: 'Head crack test', stage: 'head-crack', location: 'Head shop' },
  { code: 'PT-2', name: 'Head pressure test', stage: 'head-pressure', location: 'Head shop' },
  { code: 'DK-2', name: 'Head surfacer', stage: 'head-deck', location: 'Head shop' },
  { code: 'VS-1', name: 'Valve seat machine', stage: 'valve-seats', location: 'Head shop' },
  { code: 'HA-1', name: 'Head assembly bench', stage: 'head-assembly', location: 'Head shop' },
  { code: 'AS-1', name: 'Assembly line, position 1', stage: 'long-block-assembly', location: 'Assembly' },
  { code: 'RT-1', name: 'Run test cell', stage: 'run-test', location: 'Test cell' },
  { code: 'FI-1', name: 'Final inspection', stage: 'final-inspection', location: 'Dispatch' },
];

export const DEFECT_CODES = [
  { code: 'CRK', description: 'Crack found' },
  { code: 'LEAK', description: 'Leak under pressure or vacuum' },
  { code: 'OOT', description: 'Dimension out of tolerance' },
  { code: 'FIN', description: 'Surface finish out of range' },
  { code: 'DMG', description: 'Handling or visible damage' },
  { code: 'WRONG', description: 'Wrong part or wrong family' },
  { code: 'LOT', description: 'Purchased lot suspect' },
  { code: 'RUN', description: 'Run test out of limits' },
  { code: 'TEST', description: 'Test not run as the procedure says (pressure, time or speed)' },
  { code: 'OTHER', description: 'Other (describe)' },
];

/**
 * The demo plant's gauges (invented). `dueInDays`: the last calibration was done so that the gauge is
 * due so many days after seeding; negative is overdue (refused at stations). Each gauge's range and
 * resolution fit what the demo reads with it (ten to one against the tolerance band, limits inside
 * the range): the compression test has a gauge of its own, and the piston skirt a micrometer that
 * reaches it.
 */
export const GAUGES = [
  g('BG-014', 'Dial bore gauge 3–6 in, 0.0001 in', 'bore gauge', 0.0001, 'in', [3, 6], 180, 'Bore & hone cell', 365),
  g(
    'BG-009',
    'Dial bore gauge 2–6 in, 0.0001 in (calibration overdue)',
    'bore gauge',
    0.0001,
    'in',
    [2, 6],
    -12,
    'Line hone',
    365,
  ),
  g('BG-021', 'Dial bore gauge 2–3.5 in, 0.0001 in', 'bore gauge', 0.0001, 'in', [2, 3.5], 210, 'Line hone', 365),
  g('OM-022', 'Outside micrometer 2–3 in, 0.0001 in', 'micrometer', 0.0001, 'in', [2, 3], 150, 'Crank grinding', 365),
  g('OM-035', 'Outside micrometer 3–5 in, 0.0001 in', 'micrometer', 0.0001, 'in', [3, 5], 160, 'Assembly', 365),
  // for a bore rule tightened to ± 0.0003 in: ten to one needs 0.00006 in or finer
  g('BG-032', 'Dial bore gauge 3–5 in, 0.00005 in', 'bore gauge', 0.00005, 'in', [3, 5], 185, 'Bore & hone cell', 180),
  g('BG-030', 'Dial bore gauge 2–3 in, 0.00005 in', 'bore gauge', 0.00005, 'in', [2, 3], 175, 'Assembly', 180),
  g(
    'DI-031',
    'Dial indicator on surface plate, ±0.25 in, 0.0001 in',
    'dial indicator',
    0.0001,
    'in',
    [-0.25, 0.25],
    120,
    'Deck & heads',
    180,
  ),
  g('SE-003', 'Straightedge 24 in with feeler set', 'straightedge', 0.0005, 'in', [0, 0.03], 200, 'Deck & heads', 365),
  g('FG-012', 'Feeler gauge set 0.0015–0.035 in', 'feeler gauge', 0.0005, 'in', [0.0015, 0.035], 170, 'Assembly', 365),
  g(
    'PG-011',
    'Test pressure gauge 0–100 psi, 1 psi',
    'pressure gauge',
    1,
    'psi',
    [0, 100],
    90,
    'Pressure test bay',
    180,
  ),
  g(
    'CG-006',
    'Compression gauge 0–300 psi, 5 psi',
    'compression gauge',
    5,
    'psi',
    [0, 300],
    110,
    'Run test stand',
    180,
  ),
  g('VG-004', 'Vacuum gauge 0–30 inHg, 0.5 inHg', 'vacuum gauge', 0.5, 'inHg', [0, 30], 90, 'Head assembly', 180),
  g('TW-031', 'Click torque wrench 20–150 lbf·ft', 'torque wrench', 1, 'lbf·ft', [20, 150], 160, 'Assembly', 365),
  g(
    'DT-017',
    'Digital torque wrench 5–100 lbf·ft, 0.1 lbf·ft',
    'torque wrench',
    0.1,
    'lbf·ft',
    [5, 100],
    150,
    'Assembly',
    180,
  ),
  g('DD-002', 'Digital degree wheel, 0.1°', 'degree wheel', 0.1, 'deg', [0, 360], 190, 'Assembly', 365),
  g('PR-007', 'Profilometer, Ra', 'profilometer', 1, 'µin', [0, 400], 170, 'Bore & hone cell', 365),
  g('TM-005', 'Process timer, 0.1 min', 'timer', 0.1, 'min', [0, 120], 200, 'Pressure test bay', 365),
  g(
    'DY-001',
    'Test stand torque cell 0–600 lbf·ft, 1 lbf·ft',
    'torque cell',
    1,
    'lbf·ft',
    [0, 600],
    130,
    'Run test stand',
    180,
  ),
  g(
    'TA-002',
    'Test stand tachometer 0–8000 rpm, 10 rpm',
    'tachometer',
    10,
    'rpm',
    [0, 8000],
    130,
    'Run test stand',
    180,
  ),
  g('BL-002', 'Crankshaft balancer, 0.1 g·in', 'balancer', 0.1, 'g·in', [0, 100], 140, 'Crank grinding', 365),
];

function g(
  code: string,
  description: string,
  kind: string,
  resolution: number,
  unit: string,
  [rangeLow, rangeHigh]: [number, number],
  dueInDays: number,
  location: string,
  intervalDays: number,
) {
  const serial = `SN-${code.replace('-', '')}-${String(code.length * 7919 + resolution * 1e4).slice(0, 5)}`;
  return {
    code,
    description,
    kind,
    resolution,
    unit,
    rangeLow,
    rangeHigh,
    dueInDays,
    location,
    intervalDays,
    serial,
    owner: 'Quality',
  };
}
