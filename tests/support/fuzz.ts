import { randomUUID } from 'node:crypto';
import fc from 'fast-check';
import type { z } from 'zod';

/**
 * Generators for the fuzz suite: near-valid input built from a route's own zod schemas, with at
 * least one value in it that must be refused. A request the server accepts would be a finding, so
 * nothing here is merely odd: every hostile value is one no route may store.
 */

type Def = { type: string; [k: string]: unknown };
const defOf = (s: z.ZodType) => (s as unknown as { _zod: { def: Def } })._zod.def;

/** A leaf or container of a schema, as far as generation needs to know. */
export type Node =
  | { kind: 'object'; fields: Record<string, { node: Node; optional: boolean }> }
  | { kind: 'array'; element: Node }
  | { kind: 'record'; value: Node }
  | {
      kind: 'leaf';
      type: 'string' | 'number' | 'boolean' | 'enum' | 'other';
      format?: string;
      int?: boolean;
      schema: z.ZodType;
    };

export function describeSchema(schema: z.ZodType): Node {
  const def = defOf(schema);
  switch (def.type) {
    case 'optional':
    case 'nullable':
    case 'default':
    case 'prefault':
    case 'catch':
    case 'readonly':
      return describeSchema(def.innerType as z.ZodType);
    case 'pipe':
      // a transform's input is what the client sends
      return defOf(def.in as z.ZodType).type === 'transform'
        ? describeSchema(def.out as z.ZodType)
        : describeSchema(def.in as z.ZodType);
    case 'object': {
      const fields: Record<string, { node: Node; optional: boolean }> = {};
      for (const [k, v] of Object.entries(def.shape as Record<string, z.ZodType>)) {
        const t = defOf(v).type;
        fields[k] = { node: describeSchema(v), optional: t === 'optional' || t === 'default' || t === 'prefault' };
      }
      return { kind: 'object', fields };
    }
    case 'array':
      return { kind: 'array', element: describeSchema(def.element as z.ZodType) };
    case 'union': {
      const options = def.options as z.ZodType[];
      // an object among the options is the shape a body takes; otherwise treat it as a leaf
      const object = options.find((o) => defOf(o).type === 'object');
      return object ? describeSchema(object) : { kind: 'leaf', type: 'other', schema };
    }
    case 'record':
      return { kind: 'record', value: describeSchema(def.valueType as z.ZodType) };
    case 'string':
      return { kind: 'leaf', type: 'string', format: def.format as string | undefined, schema };
    case 'number':
      return { kind: 'leaf', type: 'number', int: Boolean((schema as unknown as { isInt?: boolean }).isInt), schema };
    case 'boolean':
      return { kind: 'leaf', type: 'boolean', schema };
    case 'enum':
    case 'literal':
      return { kind: 'leaf', type: 'enum', schema };
    default:
      return { kind: 'leaf', type: 'other', schema };
  }
}

/** Values a real client might send; each leaf keeps those its own schema accepts. */
export function plausiblePool(ids: string[], numbers: number[]) {
  const now = new Date();
  return [
    ...ids,
    'Some words about it',
    'ab',
    'TARN-6',
    'CORRIE-8',
    'BH-1',
    'bore-hone',
    'NC-2026-00001',
    now.toISOString().slice(0, 10),
    now.toISOString(),
    randomUUID(),
    `fuzz-${randomUUID().slice(0, 8)}@test.example`,
    'twelve chars or more',
    'open',
    'none',
    'true',
    'false',
    '1',
    '2',
    '25',
    ...numbers,
    true,
    false,
  ];
}

function accepted(schema: z.ZodType, pool: unknown[], query: boolean): unknown[] {
  const candidates = query ? pool.filter((v) => typeof v === 'string') : pool;
  return candidates.filter((v) => schema.safeParse(v).success);
}

/** A plausible value for a node (it may still fail a cross-field rule: that only makes it a 400). */
export function plausible(node: Node, pool: unknown[], query = false): fc.Arbitrary<unknown> {
  switch (node.kind) {
    case 'object': {
      const entries = Object.entries(node.fields).map(
        ([k, f]) =>
          [
            k,
            f.optional ? fc.option(plausible(f.node, pool, query), { nil: undefined }) : plausible(f.node, pool, query),
          ] as const,
      );
      return fc
        .record(Object.fromEntries(entries))
        .map((o) => Object.fromEntries(Object.entries(o).filter(([, v]) => v !== undefined)));
    }
    case 'array':
      return fc.array(plausible(node.element, pool, query), { maxLength: 2 });
    case 'record':
      return fc.dictionary(fc.constantFrom('bore', 'finish'), plausible(node.value, pool, query), { maxKeys: 1 });
    case 'leaf': {
      const ok = accepted(node.schema, pool, query);
      return ok.length ? fc.constantFrom(...ok) : fc.constant(query ? '1' : 'x');
    }
  }
}

// ---- values no route may store ---------------------------------------------------------------

const nulText = fc.string({ maxLength: 6 }).map((s) => `${s}\u0000${s}`);
const halfPair = fc.constantFrom('\ud800', 'a\ud83d', '\ude00b', 'x\udbff\u0041');
const badDates = fc.constantFrom('0000-01-01', '1899-12-31', '2101-01-01', '9999-12-31', '2026-02-30', '-001-01-01');
const badDateTimes = fc.constantFrom(
  '0000-01-01T00:00:00Z',
  '9999-12-31T23:59:59Z',
  '1899-12-31T23:59:59Z',
  '2026-02-30T08:00:00Z',
  '+275760-09-13T00:00:00Z',
);
const hugeNumbers = fc.constantFrom(2 ** 31, 2 ** 53 + 2, -(2 ** 31) - 1, 1e21, 1e308, -1e308, 1e9 + 0.5);
const wrongShape = fc.oneof(fc.constant({ nested: { deeper: true } }), fc.constant([[1], 'x']));

/** One value that must be refused where this node stands. */
export function hostile(node: Node, query: boolean): fc.Arbitrary<unknown> {
  if (query) {
    // query values arrive as strings
    const forLeaf =
      node.kind === 'leaf' && node.format === 'date'
        ? badDates
        : node.kind === 'leaf' && node.type === 'number'
          ? fc.constantFrom('99999999999', '-99999999999', '1e999', '2147483648', '0x10', '1.5e300')
          : fc.constant('\u0000');
    return fc.oneof(forLeaf, nulText, fc.constant(['a', 'b']));
  }
  if (node.kind !== 'leaf') return fc.oneof(fc.constant('not this'), fc.constant(42));
  if (node.type === 'string') {
    if (node.format === 'date') return fc.oneof(badDates, nulText);
    if (node.format === 'datetime') return fc.oneof(badDateTimes, nulText);
    return fc.oneof(nulText, halfPair, wrongShape);
  }
  if (node.type === 'number') {
    return node.int ? fc.oneof(hugeNumbers, fc.constant(1.5), wrongShape) : fc.oneof(fc.constant('12'), wrongShape);
  }
  if (node.type === 'enum') return fc.oneof(nulText, fc.constant('no-such-choice'), wrongShape);
  return fc.oneof(nulText, wrongShape);
}

/** Paths to every leaf of a node (array elements at index 0), for the mutation to aim at. */
export function leafPaths(node: Node, prefix: (string | number)[] = []): { path: (string | number)[]; node: Node }[] {
  switch (node.kind) {
    case 'object':
      return Object.entries(node.fields).flatMap(([k, f]) => leafPaths(f.node, [...prefix, k]));
    case 'array':
      return [{ path: prefix, node }, ...leafPaths(node.element, [...prefix, 0])];
    case 'record':
      return [{ path: [...prefix, 'bore'], node: node.value }];
    case 'leaf':
      return [{ path: prefix, node }];
  }
}

export function setAt(target: Record<string | number, unknown>, path: (string | number)[], value: unknown): unknown {
  if (!path.length) return value;
  let cur: Record<string | number, unknown> = target;
  for (let i = 0; i < path.length - 1; i++) {
    const k = path[i]!;
    const nextIsIndex = typeof path[i + 1] === 'number';
    if (typeof cur[k] !== 'object' || cur[k] === null) cur[k] = nextIsIndex ? [] : {};
    cur = cur[k] as Record<string | number, unknown>;
  }
  cur[path[path.length - 1]!] = value;
  return target;
}

/** Path parameter values that must be refused or found missing; a stray % must never be a 500. */
export const hostileParam = fc.oneof(
  fc.constantFrom('%', '%E0%A4%A', '%ZZ', '%00', '%ED%A0%80', '99999999999', '-5', '1.5', '%C0%AF', '..%2F..%2Fetc'),
  fc.string({ minLength: 1, maxLength: 40 }).map((s) => encodeURIComponent(s).replace(/%2F/g, '%252F')),
  fc.constant('x'.repeat(400)),
);

/** A real identifier typed the way people type: an en dash, a line break, lower case. */
export const oddButValid = (id: string) =>
  fc.constantFrom(
    encodeURIComponent(id),
    encodeURIComponent(id.replace('-', '–')),
    encodeURIComponent(id.replace('-', '\n')),
    encodeURIComponent(id.toLowerCase()),
  );

/** Content types a form, a text post or a broken client may send with a write. */
export const hostileContentType = fc.constantFrom(
  'text/plain',
  'application/x-www-form-urlencoded',
  'multipart/form-data',
  'multipart/form-data; boundary=',
  'application/json; charset=utf-16',
  'application/json; charset=klingon',
  'application/xml',
  ';;;',
);
