import { QueryTypes, type Sequelize } from 'sequelize';
import type { LotLookupJson, TrailJson, TrailNcr, TrailNode, TrailResult } from '../../shared/schemas/build.js';
import type { NcrState } from '../../shared/schemas/ncr.js';
import { PART_KIND_LABELS, type PartKind } from '../../shared/schemas/reference.js';
import { Item, Shipment, Signature, StageResult } from '../models/index.js';
import { checkedSerial, presentItem, type KnownLink } from './items.js';
import { notFound } from '../errors.js';
import { freshnessOf, primaryOnly, selectModels, type ReadSide } from '../read-side.js';
import { referenceData } from './reference-cache.js';
import { listFieldActions } from './field-actions.js';
import { ncrTimeline } from './ncr-timeline.js';
import { presentShipment } from './release.js';
import { presentSignature } from './signatures.js';
import { loadResultRecords } from './result-records.js';

/**
 * The trail: what is in a unit and what was done to it, for any serial. It loads in a fixed number
 * of queries whatever the genealogy holds — the genealogy in one recursive query, then each kind
 * of record for all of its items at once (indexes: item_links_parent_idx / item_links_child_idx,
 * stage_results_item_stage_idx, readings' unique (stage_result_id, …), nonconformances_item_state_idx).
 */

type Link = KnownLink & {
  link_type: 'harvested_from' | 'installed_in';
  created_at: Date;
  removed_at: Date | null;
  removed_reason: string | null;
};

/**
 * `read`: where the records are read (a hot standby when one is set up); the reference data comes
 * from the primary's cache, and the answer says how old the read side's data may be.
 */
export async function trailOf(
  sequelize: Sequelize,
  serial: string,
  read: ReadSide = primaryOnly(sequelize),
): Promise<TrailJson> {
  const db = read.db;
  const [item, ref, readFrom] = await Promise.all([
    itemBySerial(read, serial),
    referenceData(sequelize),
    freshnessOf(read),
  ]);
  // every item linked to this one, up to a core's parts' units and a unit's parts' cores: the links
  // are gathered as the walk follows them (index scans only), never by scanning item_links for
  // links among the items found, which grew with the plant's history. A part in a unit starts the
  // walk at its unit: the tree is the unit's, whose other parts may come from other cores, three
  // links away from this part. A part taken out of a unit keeps its ended link: the history of
  // what was in the unit, and when, stays in the tree.
  const links = await db.query<Link>(
    `WITH RECURSIVE g(id, depth, link_id) AS (
       SELECT COALESCE((SELECT parent_item_id FROM item_links
                         WHERE child_item_id = :id AND link_type = 'installed_in' AND removed_at IS NULL), :id::int),
              0, NULL::int
       UNION
       SELECT CASE WHEN l.parent_item_id = g.id THEN l.child_item_id ELSE l.parent_item_id END, g.depth + 1, l.id
         FROM item_links l JOIN g ON (l.parent_item_id = g.id OR l.child_item_id = g.id)
        WHERE (l.removed_at IS NULL OR l.link_type = 'installed_in') AND g.depth < 2
     )
     SELECT l.id, l.parent_item_id, l.child_item_id, l.link_type, l.created_at, l.removed_at, l.removed_reason
       FROM item_links l WHERE l.id IN (SELECT link_id FROM g)`,
    { type: QueryTypes.SELECT, replacements: { id: item.id } },
  );
  const live = links.filter((l) => !l.removed_at);
  const ids = [...new Set([item.id, ...links.flatMap((l) => [l.parent_item_id, l.child_item_id])])];
  // the items and every result among them at once; results outside the tree are dropped below
  const [items, allResults] = await Promise.all([
    selectModels(read, Item, 'id IN (:ids)', { ids }),
    selectModels(read, StageResult, 'item_id IN (:ids)', { ids }, 'finished_at, id'),
  ]);
  const byId = new Map(items.map((i) => [i.id, i]));

  const node = (i: Item, link: TrailNode['link'], children: TrailNode[], fit?: Link): TrailNode => ({
    serial: i.serial,
    kind: i.kind,
    kindLabel: PART_KIND_LABELS[i.kind as PartKind],
    status: i.status,
    positionLabel: i.positionLabel,
    familyCode: ref.family(i.engineFamilyId)?.code ?? '',
    link,
    fittedAt: fit ? new Date(fit.created_at).toISOString() : null,
    removedAt: fit?.removed_at ? new Date(fit.removed_at).toISOString() : null,
    removedReason: fit?.removed_reason ?? null,
    children,
  });
  const installedIn = (id: number) => live.find((l) => l.link_type === 'installed_in' && l.child_item_id === id);
  const harvestedFrom = (id: number) => live.find((l) => l.link_type === 'harvested_from' && l.child_item_id === id);
  const coreOf = (id: number) => {
    const l = harvestedFrom(id);
    return l ? [node(byId.get(l.parent_item_id)!, 'harvested_from', [])] : [];
  };
  let tree: TrailNode;
  const unitId = item.kind === 'long_block' ? item.id : installedIn(item.id)?.parent_item_id;
  if (unitId) {
    // every part that was ever fitted, in the order it went in; one taken out says when and why
    const parts = links
      .filter((l) => l.link_type === 'installed_in' && l.parent_item_id === unitId)
      .sort((a, b) => new Date(a.created_at).getTime() - new Date(b.created_at).getTime() || a.id - b.id);
    tree = node(
      byId.get(unitId)!,
      null,
      parts.map((l) => node(byId.get(l.child_item_id)!, 'installed_in', coreOf(l.child_item_id), l)),
    );
  } else if (item.kind === 'core') {
    const parts = links.filter((l) => l.link_type === 'harvested_from' && l.parent_item_id === item.id);
    tree = node(
      item,
      null,
      parts.map((l) => {
        const unit = installedIn(l.child_item_id);
        return node(
          byId.get(l.child_item_id)!,
          'harvested_from',
          unit ? [node(byId.get(unit.parent_item_id)!, 'installed_in', [])] : [],
        );
      }),
    );
  } else {
    // a part in no unit now: its core, and any unit it was taken out of
    const former = links.filter((l) => l.link_type === 'installed_in' && l.child_item_id === item.id);
    tree = node(item, null, [
      ...coreOf(item.id),
      ...former.map((l) => node(byId.get(l.parent_item_id)!, 'installed_in', [], l)),
    ]);
  }

  // the records of every item in the tree
  const treeIds = new Set<number>();
  const walk = (n: TrailNode) => {
    // a unit this part was taken out of is named, but its records are that unit's own trail
    if (n.kind === 'long_block' && n.removedAt) return;
    const i = items.find((x) => x.serial === n.serial);
    if (i) treeIds.add(i.id);
    n.children.forEach(walk);
  };
  walk(tree);
  const scope = [...treeIds];
  const results = allResults.filter((r) => treeIds.has(r.itemId));
  const top = byId.get(unitId ?? item.id)!;
  // everything else at once: the records around the results, NCRs (then their timelines), lots,
  // the shipment, and the item's own card
  const ncrsWithSteps = db
    .query<{
      id: number;
      number: string;
      item_id: number | null;
      lot_code: string | null;
      state: string;
      severity: string;
      description: string;
      disposition: string | null;
      disposition_reason: string | null;
      created_at: Date;
    }>(
      `SELECT n.id, n.number, n.item_id, pl.lot_code, n.state, n.severity, n.description, n.disposition,
              n.disposition_reason, n.created_at
         FROM nonconformances n LEFT JOIN part_lots pl ON pl.id = n.part_lot_id
        WHERE n.item_id IN (:scope)
           OR n.part_lot_id IN (SELECT part_lot_id FROM unit_lots WHERE unit_item_id = :top)
        ORDER BY n.created_at, n.id`,
      { type: QueryTypes.SELECT, replacements: { scope, top: top.id } },
    )
    .then(async (ncrs) => {
      const ncrIds = ncrs.map((n) => n.id);
      if (!ncrIds.length) return { ncrs, transitions: [], signatures: [] };
      const [transitions, signatures] = await Promise.all([
        db.query<{
          nonconformance_id: number;
          created_at: Date;
          from_state: NcrState | null;
          to_state: NcrState;
          actor: string;
          reason: string;
        }>(
          `SELECT t.nonconformance_id, t.created_at, t.from_state, t.to_state, u.name AS actor, t.reason
             FROM nonconformance_transitions t JOIN users u ON u.id = t.actor_id
            WHERE t.nonconformance_id IN (:ncrIds) ORDER BY t.id`,
          { type: QueryTypes.SELECT, replacements: { ncrIds } },
        ),
        selectModels(
          read,
          Signature,
          "entity = 'nonconformance' AND entity_id IN (:numbers)",
          {
            numbers: ncrs.map((n) => n.number),
          },
          'id',
        ),
      ]);
      return { ncrs, transitions, signatures };
    });
  const [records, { ncrs, transitions, signatures }, lots, shipped, card, fieldActions] = await Promise.all([
    loadResultRecords(results, items, { ref, read }),
    ncrsWithSteps,
    db.query<{
      kind: string;
      supplier: string;
      part_number: string;
      lot_code: string;
      quantity: number;
      attributes: Record<string, unknown>;
      size_class: string | null;
      matched_to: string | null;
    }>(
      `SELECT pl.part_kind AS kind, s.name AS supplier, pl.part_number, pl.lot_code, ul.quantity, pl.attributes,
              ul.size_class, ul.matched_to
         FROM unit_lots ul JOIN part_lots pl ON pl.id = ul.part_lot_id JOIN suppliers s ON s.id = pl.supplier_id
        WHERE ul.unit_item_id = :top ORDER BY ul.id`,
      { type: QueryTypes.SELECT, replacements: { top: top.id } },
    ),
    selectModels(read, Shipment, 'unit_item_id = :top', { top: top.id }, 'id DESC LIMIT 1').then(([s]) =>
      s ? presentShipment(s) : null,
    ),
    presentItem(item, { ref, genealogy: { links: live, items } }),
    top.kind === 'long_block'
      ? listFieldActions(db, { unitId: top.id, page: 1, pageSize: 200 }).then((p) => p.rows)
      : [],
  ]);

  const trailResults: TrailResult[] = results.map((r) => {
    const stage = records.stage(r);
    return {
      id: r.id,
      serial: byId.get(r.itemId)!.serial,
      stage: { code: stage.code, name: stage.name },
      station: records.station(r)?.code ?? null,
      operator: records.name(r.operatorId),
      gauge: records.gauge(r),
      verdict: r.verdict,
      finishedAt: r.finishedAt.toISOString(),
      supersedes: r.supersedesId,
      supersededBy: records.supersededBy(r),
      correctionReason: r.correctionReason,
      reentryReason: r.reentryReason,
      sizeClasses: r.sizeClasses ?? {},
      readings: records.readings(r).map(({ kind: _k, ruleId: _r, ...x }) => x),
      photos: records.photos(r),
    };
  });
  const trailNcrs: TrailNcr[] = ncrs.map((n) => ({
    number: n.number,
    serial: n.item_id ? (byId.get(n.item_id)?.serial ?? null) : null,
    lotCode: n.lot_code,
    state: n.state as NcrState,
    severity: n.severity,
    description: n.description,
    disposition: n.disposition,
    dispositionReason: n.disposition_reason,
    raisedAt: new Date(n.created_at).toISOString(),
    timeline: ncrTimeline(
      transitions
        .filter((t) => t.nonconformance_id === n.id)
        .map((t) => ({
          at: new Date(t.created_at),
          from: t.from_state,
          to: t.to_state,
          actor: t.actor,
          reason: t.reason,
        })),
      signatures.filter((s) => s.entityId === n.number),
    ),
    signatures: signatures.filter((s) => s.entityId === n.number).map(presentSignature),
  }));
  return {
    item: card,
    tree,
    lots: lots.map((l) => ({
      kind: l.kind,
      supplier: l.supplier,
      partNumber: l.part_number,
      lotCode: l.lot_code,
      quantity: l.quantity,
      attributes: l.attributes,
      sizeClass: l.size_class,
      matchedTo: l.matched_to,
    })),
    results: trailResults,
    ncrs: trailNcrs,
    shipment: shipped,
    warranty: shipped?.warranty ?? null,
    fieldActions,
    readFrom,
  };
}

/** An item by its serial, read on the read side (items.findBySerial reads the primary). */
async function itemBySerial(read: ReadSide, input: string): Promise<Item> {
  const serial = checkedSerial(input);
  const [item] = await selectModels(read, Item, 'serial = :serial', { serial });
  if (!item) throw notFound(`Serial ${serial}`);
  return item;
}

/** The lot lookup's one statement (`:lotCode` however it was typed); the benchmark runs it too. */
export const LOT_LOOKUP_SQL = `SELECT pl.id AS lot_id, pl.part_kind AS kind, s.name AS supplier, pl.part_number, pl.lot_code, pl.status,
       i.serial, f.code AS family, i.status AS unit_status, ul.created_at AS installed_at,
       to_char(sh.ship_date, 'YYYY-MM-DD') AS ship_date, c.name AS customer
  FROM part_lots pl
  JOIN suppliers s ON s.id = pl.supplier_id
  LEFT JOIN unit_lots ul ON ul.part_lot_id = pl.id
  LEFT JOIN items i ON i.id = ul.unit_item_id
  LEFT JOIN engine_families f ON f.id = i.engine_family_id
  LEFT JOIN shipments sh ON sh.unit_item_id = i.id AND sh.returned_at IS NULL
  LEFT JOIN customers c ON c.id = sh.customer_id
 WHERE upper(pl.lot_code) = upper(:lotCode)
 ORDER BY pl.id, ul.created_at`;

/** Every unit a lot code went into, with its ship date and customer (one query). */
export async function lotLookup(read: ReadSide, lotCode: string): Promise<LotLookupJson> {
  const readFrom = await freshnessOf(read);
  const rows = await read.db.query<{
    lot_id: number;
    kind: string;
    supplier: string;
    part_number: string;
    lot_code: string;
    status: string;
    serial: string | null;
    family: string | null;
    unit_status: string | null;
    installed_at: Date | null;
    ship_date: string | null;
    customer: string | null;
  }>(LOT_LOOKUP_SQL, { type: QueryTypes.SELECT, replacements: { lotCode } });
  const lots = new Map<number, LotLookupJson['lots'][number]>();
  for (const r of rows) {
    let lot = lots.get(r.lot_id);
    if (!lot) {
      lot = {
        kind: r.kind,
        supplier: r.supplier,
        partNumber: r.part_number,
        lotCode: r.lot_code,
        status: r.status,
        units: [],
      };
      lots.set(r.lot_id, lot);
    }
    if (r.serial) {
      lot.units.push({
        serial: r.serial,
        family: r.family ?? '',
        status: r.unit_status ?? '',
        installedAt: new Date(r.installed_at!).toISOString(),
        shipDate: r.ship_date,
        customer: r.customer,
      });
    }
  }
  return { lotCode: lotCode.toUpperCase(), lots: [...lots.values()], readFrom };
}
