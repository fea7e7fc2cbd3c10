import Decimal from 'decimal.js';

/**
 * Units of measure, and conversion between units of the same quantity. The one module the station
 * form, the submission, gauge suitability and the engine arithmetic convert through.
 *
 * Every factor is the unit's size in the quantity's SI unit, from NIST Special Publication 811
 * (2008), Appendix B.8 (B.9 for temperature): exact where the publication marks it exact,
 * otherwise the value the exact definition gives (the tabled, rounded figure beside it). Factors
 * are strings so decimal.js keeps them exact: 1 in = 0.0254 m and 1 mm = 0.001 m make 25.4 mm per
 * inch, not 25.400000000000002.
 */

export const QUANTITIES = [
  'length',
  'pressure',
  'torque',
  'temperature',
  'power',
  'volume',
  'angle',
  'time',
  'rotational_speed',
  'imbalance',
  'ratio',
] as const;
export type Quantity = (typeof QUANTITIES)[number];

export const QUANTITY_NAMES: Record<Quantity, string> = {
  length: 'length',
  pressure: 'pressure',
  torque: 'torque',
  temperature: 'temperature',
  power: 'power',
  volume: 'volume',
  angle: 'angle',
  time: 'time',
  rotational_speed: 'rotational speed',
  imbalance: 'imbalance',
  ratio: 'ratio',
};

export type UnitDef = {
  symbol: string;
  name: string;
  quantity: Quantity;
  /** The unit's size in the quantity's SI unit (m, Pa, N·m, K, W, m³, rad, s, r/min, kg·m, 1). */
  factor: string;
  /** Added after scaling, for temperatures: K = value × factor + offset. */
  offset?: string;
};

// lbf = 4.448 221 615 260 5 N exactly (0.453 592 37 kg × 9.806 65 m/s²), ft = 0.3048 m exactly
const LBF = '4.4482216152605';
const lbf = new Decimal(LBF);

export const UNITS: readonly UnitDef[] = [
  // length: SI unit m
  { symbol: 'm', name: 'metre', quantity: 'length', factor: '1' },
  { symbol: 'cm', name: 'centimetre', quantity: 'length', factor: '0.01' },
  { symbol: 'mm', name: 'millimetre', quantity: 'length', factor: '0.001' },
  { symbol: 'µm', name: 'micrometre', quantity: 'length', factor: '0.000001' },
  { symbol: 'in', name: 'inch', quantity: 'length', factor: '0.0254' }, // B.8: 2.54 E-02 exact
  { symbol: 'ft', name: 'foot', quantity: 'length', factor: '0.3048' }, // B.8: 3.048 E-01 exact
  { symbol: 'µin', name: 'microinch', quantity: 'length', factor: '0.0000000254' }, // B.8: 2.54 E-08 exact
  // pressure: SI unit Pa
  { symbol: 'Pa', name: 'pascal', quantity: 'pressure', factor: '1' },
  { symbol: 'kPa', name: 'kilopascal', quantity: 'pressure', factor: '1000' },
  { symbol: 'MPa', name: 'megapascal', quantity: 'pressure', factor: '1000000' },
  { symbol: 'bar', name: 'bar', quantity: 'pressure', factor: '100000' }, // B.8: 1.0 E+05 exact
  // B.8: 6.894 757 E+03; lbf / (0.0254 m)²
  { symbol: 'psi', name: 'pound-force per square inch', quantity: 'pressure', factor: lbf.div('0.00064516').toFixed() },
  // B.8: inch of mercury, conventional, 3.386 389 E+03 tabled; 25.4 × the conventional millimetre of
  // mercury, 133.322 387 415 Pa (13.5951 g/cm³ × 9.806 65 m/s² × 1 mm)
  { symbol: 'inHg', name: 'inch of mercury', quantity: 'pressure', factor: '3386.388640341' },
  // torque: SI unit N·m
  { symbol: 'N·m', name: 'newton metre', quantity: 'torque', factor: '1' },
  { symbol: 'lbf·ft', name: 'pound-force foot', quantity: 'torque', factor: lbf.times('0.3048').toFixed() }, // B.8: 1.355 818 E+00
  { symbol: 'lbf·in', name: 'pound-force inch', quantity: 'torque', factor: lbf.times('0.0254').toFixed() }, // B.8: 1.129 848 E-01
  // temperature: SI unit K; B.9: T/K = t/°C + 273.15, T/K = (t/°F + 459.67)/1.8
  { symbol: 'K', name: 'kelvin', quantity: 'temperature', factor: '1' },
  { symbol: '°C', name: 'degree Celsius', quantity: 'temperature', factor: '1', offset: '273.15' },
  {
    symbol: '°F',
    name: 'degree Fahrenheit',
    quantity: 'temperature',
    factor: new Decimal(1).div('1.8').toFixed(30),
    offset: new Decimal('459.67').div('1.8').toFixed(30),
  },
  // power: SI unit W
  { symbol: 'W', name: 'watt', quantity: 'power', factor: '1' },
  { symbol: 'kW', name: 'kilowatt', quantity: 'power', factor: '1000' },
  // B.8: horsepower (550 ft·lbf/s) 7.456 999 E+02
  { symbol: 'hp', name: 'horsepower', quantity: 'power', factor: lbf.times('0.3048').times(550).toFixed() },
  // volume: SI unit m³
  { symbol: 'cm³', name: 'cubic centimetre', quantity: 'volume', factor: '0.000001' },
  { symbol: 'L', name: 'litre', quantity: 'volume', factor: '0.001' }, // B.8: 1.0 E-03 exact
  { symbol: 'in³', name: 'cubic inch', quantity: 'volume', factor: '0.000016387064' }, // B.8: 1.638 706 4 E-05 exact
  // angle: SI unit rad; B.8: degree 1.745 329 E-02
  { symbol: 'deg', name: 'degree', quantity: 'angle', factor: new Decimal(Math.PI).div(180).toFixed(20) },
  // time: SI unit s
  { symbol: 's', name: 'second', quantity: 'time', factor: '1' },
  { symbol: 'min', name: 'minute', quantity: 'time', factor: '60' },
  { symbol: 'h', name: 'hour', quantity: 'time', factor: '3600' },
  // rotational speed: revolutions per minute has no other unit in a plant
  { symbol: 'rpm', name: 'revolutions per minute', quantity: 'rotational_speed', factor: '1' },
  // imbalance (mass × radius): SI unit kg·m; B.8: ounce (avoirdupois) 2.834 952 E-02 kg
  { symbol: 'g·mm', name: 'gram millimetre', quantity: 'imbalance', factor: '0.000001' },
  { symbol: 'g·cm', name: 'gram centimetre', quantity: 'imbalance', factor: '0.00001' },
  { symbol: 'g·in', name: 'gram inch', quantity: 'imbalance', factor: '0.0000254' },
  {
    symbol: 'oz·in',
    name: 'ounce inch',
    quantity: 'imbalance',
    factor: new Decimal('0.028349523125').times('0.0254').toFixed(),
  },
  { symbol: '%', name: 'percent', quantity: 'ratio', factor: '0.01' },
];

/** The symbols Coretrail knows, for schemas: a characteristic's unit is one of these. */
export const UNIT_SYMBOLS = UNITS.map((u) => u.symbol) as [string, ...string[]];

const BY_SYMBOL = new Map(UNITS.map((u) => [u.symbol, u]));

/** Spellings people type for a unit, mapped to its symbol (the Greek mu and the micro sign are both µ). */
const ALIASES: Record<string, string> = {
  μm: 'µm',
  um: 'µm',
  μin: 'µin',
  uin: 'µin',
  Nm: 'N·m',
  'N.m': 'N·m',
  'lbf.ft': 'lbf·ft',
  'lb·ft': 'lbf·ft',
  'ft·lbf': 'lbf·ft',
  'lbf.in': 'lbf·in',
  'in·lbf': 'lbf·in',
  degC: '°C',
  degF: '°F',
  cm3: 'cm³',
  in3: 'in³',
  '°': 'deg',
};

export function unitOf(symbol: string | null | undefined): UnitDef | null {
  if (symbol === null || symbol === undefined) return null;
  return BY_SYMBOL.get(symbol) ?? BY_SYMBOL.get(ALIASES[symbol] ?? '') ?? null;
}

/** The units a reading in `symbol` may also be entered in: the others of its quantity. */
export function alternativesOf(symbol: string | null | undefined): UnitDef[] {
  const u = unitOf(symbol);
  if (!u) return [];
  return UNITS.filter((x) => x.quantity === u.quantity && x.symbol !== u.symbol);
}

/** Inch or metric: the unit system a person's readings start in (their profile). */
export type UnitSystem = 'inch' | 'metric';

// A unit's usual counterpart in the other system at a machine shop's resolutions (common practice):
// a bore in inches is read in millimetres, a finish in microinches in micrometres, and so on.
const COUNTERPART: Record<UnitSystem, Record<string, string>> = {
  metric: {
    in: 'mm',
    ft: 'm',
    µin: 'µm',
    psi: 'kPa',
    inHg: 'kPa',
    'lbf·ft': 'N·m',
    'lbf·in': 'N·m',
    '°F': '°C',
    'in³': 'cm³',
    hp: 'kW',
    'oz·in': 'g·mm',
    'g·in': 'g·mm',
  },
  inch: {
    mm: 'in',
    cm: 'in',
    m: 'ft',
    µm: 'µin',
    kPa: 'psi',
    MPa: 'psi',
    bar: 'psi',
    'N·m': 'lbf·ft',
    '°C': '°F',
    'cm³': 'in³',
    L: 'in³',
    kW: 'hp',
    'g·mm': 'oz·in',
    'g·cm': 'oz·in',
  },
};

/**
 * The unit a reading in `symbol` starts in for someone who works in `system`: its counterpart in
 * that system, or `symbol` itself when it already belongs there or has no counterpart (rpm, %, min).
 */
export function unitInSystem(symbol: string, system: UnitSystem): string {
  const own = unitOf(symbol)?.symbol ?? symbol;
  return COUNTERPART[system][own] ?? own;
}

/** Whether two units measure the same quantity (a value in one converts to the other). */
export function sameQuantity(a: string | null | undefined, b: string | null | undefined): boolean {
  const x = unitOf(a);
  const y = unitOf(b);
  return !!x && !!y && x.quantity === y.quantity;
}

/**
 * `value` in `from` expressed in `to`, as a Decimal (no binary rounding on the way), or null when the
 * units are of different quantities or unknown. The same unit (or both none) returns the value.
 */
export function convertDecimal(
  value: Decimal.Value,
  from: string | null | undefined,
  to: string | null | undefined,
): Decimal | null {
  if ((from ?? null) === (to ?? null)) return new Decimal(value);
  const a = unitOf(from);
  const b = unitOf(to);
  if (!a || !b || a.quantity !== b.quantity) return null;
  if (a.symbol === b.symbol) return new Decimal(value);
  const si = new Decimal(value).times(a.factor).plus(a.offset ?? 0);
  return si.minus(b.offset ?? 0).div(b.factor);
}

/** `value` in `from` expressed in `to`, or null when they do not convert. */
export function convert(value: number, from: string | null | undefined, to: string | null | undefined): number | null {
  return convertDecimal(value, from, to)?.toNumber() ?? null;
}

/**
 * The factor that takes a value in `from` to `to` (value × factor), or null when the units do not
 * convert by a factor alone: different quantities, unknown units, or temperatures with an offset.
 * A gauge's range and resolution scale by it.
 */
export function conversionFactor(from: string | null | undefined, to: string | null | undefined): number | null {
  if ((from ?? null) === (to ?? null)) return 1;
  const a = unitOf(from);
  const b = unitOf(to);
  if (!a || !b || a.quantity !== b.quantity) return null;
  if (a.symbol === b.symbol) return 1;
  if (a.offset || b.offset) return null;
  return new Decimal(a.factor).div(b.factor).toNumber();
}

/**
 * A difference (a resolution, a tolerance band, an error) in `from` expressed in `to`: scaled, never
 * offset, so 1 °C of band is 1.8 °F of band.
 */
export function convertDifference(value: number, from: string | null | undefined, to: string | null | undefined) {
  if ((from ?? null) === (to ?? null)) return value;
  const a = unitOf(from);
  const b = unitOf(to);
  if (!a || !b || a.quantity !== b.quantity) return null;
  return new Decimal(value).times(a.factor).div(b.factor).toNumber();
}

/** The conversion factors the engine arithmetic and older callers name directly. */
const f = (from: string, to: string) => conversionFactor(from, to)!;
export const FACTORS = {
  inToMm: f('in', 'mm'), // exact
  microinToMicrom: f('µin', 'µm'), // exact
  lbfFtToNm: f('lbf·ft', 'N·m'), // 1.355 818 E+00 tabled; 1.355 817 948 3 from the exact lbf and ft
  psiToKPa: f('psi', 'kPa'), // 6.894 757 E+00 tabled
  inHgToKPa: f('inHg', 'kPa'), // conventional inch of mercury, 3.386 389 E+00
  in3ToCm3: f('in³', 'cm³'), // exact
  hpToW: f('hp', 'W'), // 1 hp = 550 ft·lbf/s = 7.456 999 E+02 W
} as const;

export const inToMm = (v: number) => v * FACTORS.inToMm;
export const mmToIn = (v: number) => v / FACTORS.inToMm;
export const microinToMicrom = (v: number) => v * FACTORS.microinToMicrom;
export const lbfFtToNm = (v: number) => v * FACTORS.lbfFtToNm;
export const nmToLbfFt = (v: number) => v / FACTORS.lbfFtToNm;
export const psiToKPa = (v: number) => v * FACTORS.psiToKPa;
export const kPaToPsi = (v: number) => v / FACTORS.psiToKPa;
export const inHgToKPa = (v: number) => v * FACTORS.inHgToKPa;
export const in3ToCm3 = (v: number) => v * FACTORS.in3ToCm3;
export const hpToW = (v: number) => v * FACTORS.hpToW;
