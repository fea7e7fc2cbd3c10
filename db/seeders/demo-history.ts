import { randomUUID } from 'node:crypto';
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { evaluateForm, type Entries, type EvaluatedReading } from '../../shared/domain/evaluate.js';
import { expandPositions } from '../../shared/domain/positions.js';
import { makeSerial } from '../../shared/domain/serial.js';
import { limitsOf } from '../../shared/domain/tolerance.js';
import type { PartKind } from '../../shared/schemas/reference.js';
import { recordAudit, systemCtx } from '../../server/audit.js';
import { Customer, Item, Station, User, type EngineFamily } from '../../server/models/index.js';
import { referenceData, type Reference } from '../../server/services/reference-cache.js';
import { formCharacteristics, toRuleInForce } from '../../server/services/spec/index.js';
import { fitOf } from '../../server/services/gauge-suitability.js';
import { PREFERRED_GAUGE } from './demo-parts.js';
import { passingReadings } from './sample-readings.js';

/**
 * Demo history: shipped units of both families over the last months, so the control charts and
 * capability of the cylinder bore have something real to show on first start. Written with a few
 * set-based statements (the station service would take minutes for this many results, and cannot
 * date a result in the past). Every item carries `attributes.demoHistory` and every result the note
 * "Demo history", so nobody takes them for the plant's own records.
 *
 * Each unit has what a shipped unit made by the product has — core and receipt, teardown, parts
 * walked along their routes with every reading judged by the shared evaluator against the rules in
 * force at seeding (version 1 of the demo's spec book, which starts then), genealogy links, the unit's own stages and its shipment — except supplier lots. Most
 * readings are the passing middle of their limits; the bores follow a honing process: part-to-part
 * and within-part variation, a slow drift as the stones wear, a reset at each stone change, and one
 * spell where a gauge read high.
 */

const PRNG_SEED = 20261203;
export const HISTORY_NOTE = 'Demo history';

/** mulberry32, a small seeded generator (common practice), so every demo starts with the same history. */
function seeded(seed: number) {
  let a = seed >>> 0;
  const next = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  // Box–Muller for normal draws
  const normal = () => Math.sqrt(-2 * Math.log(1 - next())) * Math.cos(2 * Math.PI * next());
  return { next, normal, int: (n: number) => Math.floor(next() * n) };
}

type Rows = Record<string, unknown[]>;
const columns = (names: string[]): Rows => Object.fromEntries(names.map((n) => [n, []]));
const push = (rows: Rows, row: Record<string, unknown>) => {
  for (const k of Object.keys(rows)) rows[k]!.push(row[k] ?? null);
};

/** One INSERT of many rows through unnest (typed arrays as bind parameters). */
async function insertRows(
  sequelize: Sequelize,
  transaction: Transaction,
  table: string,
  rows: Rows,
  types: Record<string, string>,
) {
  const names = Object.keys(rows);
  const count = rows[names[0]!]!.length;
  for (let from = 0; from < count; from += 20_000) {
    const bind = names.map((n) => rows[n]!.slice(from, from + 20_000));
    await sequelize.query(
      `INSERT INTO ${table} (${names.join(', ')})
       SELECT * FROM unnest(${names.map((n, i) => `$${i + 1}::${types[n]}[]`).join(', ')})`,
      { bind, transaction },
    );
  }
}

/** Reserves `n` ids from a table's sequence; returns the first. */
async function reserveIds(sequelize: Sequelize, transaction: Transaction, table: string, n: number) {
  const [row] = await sequelize.query<{ first: string }>(
    `SELECT setval('${table}_id_seq', nextval('${table}_id_seq') + ${n} - 1) - ${n} + 1 AS first`,
    { type: QueryTypes.SELECT, transaction },
  );
  return Number(row!.first);
}

type Template = { stageId: number; stationId: number | null; readings: EvaluatedReading[]; chars: Chars };
type Chars = ReturnType<typeof formCharacteristics>;

/** Passing readings for one stage of one part kind, judged once by the shared evaluator. */
function stageTemplate(
  ref: Reference,
  family: EngineFamily,
  kind: PartKind,
  label: string | null,
  stageId: number,
  stationId: number | null,
  at: Date,
): Template {
  const item = { kind, positionLabel: label };
  const chars = formCharacteristics(ref, stageId, family.id, at, (c) => expandPositions(c.positions, family, item));
  const readings = judge(chars, passingReadings({ characteristics: chars } as never));
  if (readings.some((r) => r.verdict !== 'pass')) throw new Error(`demo history: stage ${stageId} does not pass`);
  return { stageId, stationId, readings, chars };
}

function judge(chars: Chars, inputs: ReturnType<typeof passingReadings>): EvaluatedReading[] {
  const entries: Entries = {};
  for (const r of inputs)
    (entries[r.characteristic] ??= {})[r.position] = { value: r.value ?? null, passed: r.passed ?? null };
  return evaluateForm(chars, entries).readings;
}

export async function seedDemoHistory(
  sequelize: Sequelize,
  { unitsPerFamily = 120, days = 240 }: { unitsPerFamily?: number; days?: number } = {},
) {
  const rng = seeded(PRNG_SEED);
  const ref = await referenceData(sequelize);
  const user = async (role: string) => (await User.findOne({ where: { email: `${role}@larkspur.example` } }))!;
  const [operator, receiving, shipping] = [await user('operator'), await user('receiving'), await user('shipping')];
  const customers = await Customer.findAll({ order: [['id', 'ASC']] });
  const stations = await Station.findAll({ where: { active: true }, order: [['id', 'ASC']] });
  const stationOf = (stageId: number) => stations.find((s) => s.stageId === stageId)?.id ?? null;
  const gaugeByCode = new Map(ref.gauges.map((g) => [g.code, g.id]));
  // a gauge that can measure the characteristic (unit, range, resolution), the plant's usual one first
  const gaugeFor = (c: Parameters<typeof fitOf>[2]) => {
    const fit = ref.gauges.filter((g) => g.code !== 'BG-009' && fitOf(ref, g, c).ok);
    return (
      (fit.find((g) => g.code === PREFERRED_GAUGE[c.code]) ?? fit.find((g) => g.unit === c.unit) ?? fit[0])?.id ?? null
    );
  };
  const now = Date.now();
  const serials = new Set((await Item.findAll({ attributes: ['serial'] })).map((i) => i.serial));
  const serial = (kind: PartKind) => {
    let s: string;
    do s = makeSerial(kind, rng.int);
    while (serials.has(s));
    serials.add(s);
    return s;
  };

  const items = columns([
    'id',
    'serial',
    'kind',
    'engine_family_id',
    'status',
    'route_id',
    'position_label',
    'attributes',
    'created_by_id',
    'created_at',
    'updated_at',
  ]);
  const receipts = columns([
    'item_id',
    'casting_number',
    'id_number',
    'source',
    'customer_id',
    'source_reference',
    'received_on',
    'received_by_id',
    'grade',
    'accepted',
    'credit_decision',
    'created_at',
    'updated_at',
  ]);
  const links = columns(['parent_item_id', 'child_item_id', 'link_type', 'created_by_id', 'created_at']);
  const results = columns([
    'id',
    'item_id',
    'stage_id',
    'station_id',
    'operator_id',
    'gauge_id',
    'finished_at',
    'verdict',
    'idempotency_key',
    'notes',
    'created_at',
  ]);
  const readings = columns([
    'stage_result_id',
    'characteristic_id',
    'position',
    'value',
    'passed',
    'unit',
    'verdict',
    'tolerance_rule_id',
    'rule_version',
    'gauge_id',
    'created_at',
  ]);
  const shipments = columns([
    'unit_item_id',
    'customer_id',
    'reference',
    'carrier',
    'shipped_at',
    'released_by_id',
    'warranty_ends_on',
    'warranty_km',
    'ship_date',
    'warranty_months',
    'created_at',
  ]);

  const families = ref.families.filter((f) => f.active);
  const partsPerUnit = (f: EngineFamily) => 5 + (f.headsPerEngine === 2 ? 1 : 0); // core, block, crank, heads, unit
  const itemCount = families.reduce((n, f) => n + unitsPerFamily * partsPerUnit(f), 0);
  let nextItem = 0;
  let nextResult = 0;
  const ids = await sequelize.transaction(async (t) => ({
    item: await reserveIds(sequelize, t, 'items', itemCount),
  }));
  nextItem = ids.item;

  type Planned = {
    itemId: number;
    stageId: number;
    stationId: number | null;
    at: Date;
    readings: EvaluatedReading[];
    chars: Chars;
    gaugeOverride?: number | null;
  };
  const planned: Planned[] = [];

  for (const [fi, family] of families.entries()) {
    const route = (kind: PartKind) => ref.route(family.id, kind);
    const headLabels = family.headsPerEngine === 2 ? ['left', 'right'] : [null];
    const templates = new Map<string, Template[]>();
    const templatesOf = (kind: PartKind, label: string | null, at: Date) => {
      const key = `${kind}:${label}`;
      if (!templates.has(key)) {
        templates.set(
          key,
          (route(kind)?.steps ?? []).map((s) =>
            stageTemplate(ref, family, kind, label, s.stageId, stationOf(s.stageId), at),
          ),
        );
      }
      return templates.get(key)!;
    };
    const teardown = route('core')?.steps.find((s) => s.stage.code === 'teardown');
    const boreChar = ref
      .characteristics(route('block')?.steps.find((s) => s.stage.code === 'bore-hone')?.stageId ?? -1)
      .find((c) => c.code === 'bore');
    const boreRule = boreChar ? ref.rules(family.id, boreChar.id).find((r) => r.status === 'approved') : undefined;
    const bore = boreRule ? limitsOf(toRuleInForce(boreRule)) : null;
    const nominal = bore && bore.lower !== null && bore.upper !== null ? (bore.lower + bore.upper) / 2 : null;
    const half = bore && bore.lower !== null && bore.upper !== null ? (bore.upper - bore.lower) / 2 : 0;
    const step = Number(boreChar?.resolution ?? 0.0001);

    for (let h = 0; h < unitsPerFamily; h++) {
      // shipped evenly over the period, the two families interleaved
      const shipAt = new Date(
        now - days * 86_400_000 * (1 - (h + fi / families.length) / unitsPerFamily) - 2 * 86_400_000,
      );
      const hours = (n: number) => new Date(shipAt.getTime() - n * 3_600_000);
      const core = nextItem++;
      const block = nextItem++;
      const crank = nextItem++;
      const heads = headLabels.map(() => nextItem++);
      const unit = nextItem++;
      const attrs = JSON.stringify({ demoHistory: true });
      const addItem = (id: number, kind: PartKind, status: string, label: string | null, at: Date) =>
        push(items, {
          id,
          serial: serial(kind),
          kind,
          engine_family_id: family.id,
          status,
          route_id: route(kind)?.route.id ?? null,
          position_label: label,
          attributes: attrs,
          created_by_id: kind === 'core' ? receiving.id : operator.id,
          created_at: at,
          updated_at: shipAt,
        });
      addItem(core, 'core', 'torn_down', null, hours(170));
      push(receipts, {
        item_id: core,
        casting_number: `${family.code.slice(0, 2)}-${10000 + h}`,
        id_number: `H${family.id}${String(h).padStart(5, '0')}`,
        source: 'customer_return',
        customer_id: customers[h % customers.length]!.id,
        source_reference: `RMA-H${family.id}${String(h).padStart(5, '0')}`,
        received_on: hours(170).toISOString().slice(0, 10),
        received_by_id: receiving.id,
        grade: 'sound',
        accepted: true,
        credit_decision: 'full',
        created_at: hours(170),
        updated_at: hours(170),
      });
      if (teardown)
        planned.push({
          itemId: core,
          stageId: teardown.stageId,
          stationId: stationOf(teardown.stageId),
          at: hours(160),
          readings: [],
          chars: [],
        });
      const parts: [number, PartKind, string | null][] = [
        [block, 'block', null],
        [crank, 'crankshaft', null],
        ...heads.map((id, i): [number, PartKind, string | null] => [id, 'cylinder_head', headLabels[i]!]),
      ];
      for (const [id, kind, label] of parts) {
        addItem(id, kind, 'installed', label, hours(160));
        push(links, {
          parent_item_id: core,
          child_item_id: id,
          link_type: 'harvested_from',
          created_by_id: operator.id,
          created_at: hours(160),
        });
        push(links, {
          parent_item_id: unit,
          child_item_id: id,
          link_type: 'installed_in',
          created_by_id: operator.id,
          created_at: hours(30),
        });
        templatesOf(kind, label, new Date(now)).forEach((tpl, j) => {
          const at = hours(150 - j * 8 - (kind === 'block' ? 0 : 2));
          if (kind === 'block' && boreChar && nominal !== null && ref.stage(tpl.stageId)?.code === 'bore-hone') {
            planned.push({
              itemId: id,
              ...tpl,
              at,
              ...honed(tpl, boreChar.code, nominal, half, step, h, fi, rng, at, now),
            });
          } else {
            planned.push({ itemId: id, ...tpl, at });
          }
        });
      }
      addItem(unit, 'long_block', 'shipped', null, hours(30));
      templatesOf('long_block', null, new Date(now)).forEach((tpl, j) =>
        planned.push({ itemId: unit, ...tpl, at: hours(24 - j * 6) }),
      );
      const ship = new Date(shipAt);
      const ends = new Date(ship);
      ends.setUTCMonth(ends.getUTCMonth() + family.warrantyMonths);
      push(shipments, {
        unit_item_id: unit,
        customer_id: customers[(h + 2) % customers.length]!.id,
        reference: `SO-H${family.id}${String(h).padStart(4, '0')}`,
        carrier: 'Valley Freight',
        shipped_at: ship,
        released_by_id: shipping.id,
        warranty_ends_on: ends.toISOString().slice(0, 10),
        warranty_km: family.warrantyKm,
        ship_date: ship.toISOString().slice(0, 10),
        warranty_months: family.warrantyMonths,
        created_at: ship,
      });
    }
  }

  return sequelize.transaction(async (transaction) => {
    nextResult = await reserveIds(sequelize, transaction, 'stage_results', planned.length);
    for (const p of planned) {
      const id = nextResult++;
      const firstGauge = p.chars.find((c) => c.kind === 'variable' && !c.optional);
      const gauge = p.gaugeOverride !== undefined ? p.gaugeOverride : firstGauge ? gaugeFor(firstGauge) : null;
      push(results, {
        id,
        item_id: p.itemId,
        stage_id: p.stageId,
        station_id: p.stationId,
        operator_id: operator.id,
        gauge_id: gauge,
        finished_at: p.at,
        verdict: 'pass',
        idempotency_key: randomUUID(),
        notes: HISTORY_NOTE,
        created_at: p.at,
      });
      const kindOf = new Map(p.chars.map((c) => [c.code, c]));
      for (const r of p.readings) {
        const c = kindOf.get(r.characteristic)!;
        push(readings, {
          stage_result_id: id,
          characteristic_id: c.id,
          position: r.position,
          value: r.value,
          passed: r.passed,
          unit: c.kind === 'attribute' ? null : c.unit,
          verdict: r.verdict ?? 'fail',
          tolerance_rule_id: r.ruleId,
          rule_version: r.ruleVersion,
          gauge_id: c.kind === 'variable' ? (c.code === 'bore' && gauge ? gauge : gaugeFor(c)) : null,
          created_at: p.at,
        });
      }
    }
    await insertRows(sequelize, transaction, 'items', items, {
      id: 'int',
      serial: 'varchar',
      kind: 'varchar',
      engine_family_id: 'int',
      status: 'varchar',
      route_id: 'int',
      position_label: 'varchar',
      attributes: 'jsonb',
      created_by_id: 'int',
      created_at: 'timestamptz',
      updated_at: 'timestamptz',
    });
    await insertRows(sequelize, transaction, 'core_receipts', receipts, {
      item_id: 'int',
      casting_number: 'varchar',
      id_number: 'varchar',
      source: 'varchar',
      customer_id: 'int',
      source_reference: 'varchar',
      received_on: 'date',
      received_by_id: 'int',
      grade: 'varchar',
      accepted: 'boolean',
      credit_decision: 'varchar',
      created_at: 'timestamptz',
      updated_at: 'timestamptz',
    });
    await insertRows(sequelize, transaction, 'item_links', links, {
      parent_item_id: 'int',
      child_item_id: 'int',
      link_type: 'varchar',
      created_by_id: 'int',
      created_at: 'timestamptz',
    });
    await insertRows(sequelize, transaction, 'stage_results', results, {
      id: 'int',
      item_id: 'int',
      stage_id: 'int',
      station_id: 'int',
      operator_id: 'int',
      gauge_id: 'int',
      finished_at: 'timestamptz',
      verdict: 'varchar',
      idempotency_key: 'uuid',
      notes: 'text',
      created_at: 'timestamptz',
    });
    await insertRows(sequelize, transaction, 'readings', readings, {
      stage_result_id: 'int',
      characteristic_id: 'int',
      position: 'varchar',
      value: 'numeric',
      passed: 'boolean',
      unit: 'varchar',
      verdict: 'varchar',
      tolerance_rule_id: 'int',
      rule_version: 'int',
      gauge_id: 'int',
      created_at: 'timestamptz',
    });
    await insertRows(sequelize, transaction, 'shipments', shipments, {
      unit_item_id: 'int',
      customer_id: 'int',
      reference: 'varchar',
      carrier: 'varchar',
      shipped_at: 'timestamptz',
      released_by_id: 'int',
      warranty_ends_on: 'date',
      warranty_km: 'int',
      ship_date: 'date',
      warranty_months: 'int',
      created_at: 'timestamptz',
    });
    const counts = {
      units: shipments.unit_item_id!.length,
      items: items.id!.length,
      results: results.id!.length,
      readings: readings.stage_result_id!.length,
      days,
    };
    await recordAudit(systemCtx('seed'), transaction, {
      action: 'demo.history_seeded',
      entity: 'demo',
      entityId: 'history',
      after: { ...counts, note: `Items carry attributes.demoHistory; results the note "${HISTORY_NOTE}"` },
    });
    return counts;
  });

  /**
   * A block's bore-and-hone readings from the honing process: the part mean wanders with stone
   * wear (a saw-tooth reset at each stone change), parts differ, positions within a part differ a
   * little less; one bore gauge (BG-009, since overdue) read high for a spell. Re-judged, with the
   * derived out-of-round and taper, by the shared evaluator; redrawn if a draw would fail.
   */
  function honed(
    tpl: Template,
    code: string,
    nominal: number,
    half: number,
    step: number,
    h: number,
    fi: number,
    r: ReturnType<typeof seeded>,
    at: Date,
    today: number,
  ): { readings: EvaluatedReading[]; gaugeOverride: number | null } {
    const wear = ((h % 30) / 30 - 0.5) * 0.3 * half;
    const oldGauge = at.getTime() < today - 60 * 86_400_000 && h % 3 === 0;
    const bias = oldGauge ? 0.15 * half : 0;
    // a shift for one family during a spell, as after a hone head was rebuilt
    const shift = fi === 1 && h >= 70 && h < 80 ? 0.35 * half : 0;
    const inputs = passingReadings({ characteristics: tpl.chars } as never);
    for (let attempt = 0; attempt < 20; attempt++) {
      const mean = nominal + wear + bias + shift + r.normal() * 0.12 * half;
      const drawn = inputs.map((x) =>
        x.characteristic === code
          ? {
              ...x,
              value: Number(
                (
                  Math.round(
                    Math.min(nominal + 0.9 * half, Math.max(nominal - 0.9 * half, mean + r.normal() * 0.1 * half)) /
                      step,
                  ) * step
                ).toFixed(6),
              ),
            }
          : x,
      );
      const judged = judge(tpl.chars, drawn);
      if (judged.every((x) => x.verdict === 'pass')) {
        return {
          readings: judged,
          gaugeOverride: oldGauge ? (gaugeByCode.get('BG-009') ?? null) : (gaugeByCode.get('BG-014') ?? null),
        };
      }
    }
    return { readings: tpl.readings, gaugeOverride: gaugeByCode.get('BG-014') ?? null };
  }
}
