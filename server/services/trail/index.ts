import type { Sequelize } from 'sequelize';
import type { TrailJson } from '../../../shared/schemas/trail.js';
import { Item, Shipment, StageResult } from '../../models/index.js';
import { notFound } from '../../errors.js';
import { freshnessOf, primaryOnly, selectModels, type ReadSide } from '../../read-side.js';
import { listFieldActions } from '../field-actions.js';
import { checkedSerial, presentItem } from '../items.js';
import { referenceData } from '../reference-cache.js';
import { presentShipment } from '../release/index.js';
import { loadResultRecords } from '../result-records.js';
import { genealogyTree, itemsInTree, linksAround } from './genealogy.js';
import { presentTrailLots, presentTrailNcrs, presentTrailResults } from './present.js';
import { lotsOfUnit, ncrsOfTree } from './records.js';

export { LOT_LOOKUP_SQL, lotLookup } from './lot-lookup.js';

/**
 * The trail: what is in a unit and what was done to it, for any serial. It loads in a fixed number
 * of queries whatever the genealogy holds — the genealogy in one recursive query, then each kind
 * of record for all of its items at once (indexes: item_links_parent_idx / item_links_child_idx,
 * stage_results_item_stage_idx, readings' unique (stage_result_id, …), nonconformances_item_state_idx).
 *
 * `read`: where the records are read (a hot standby when one is set up); the reference data comes
 * from the primary's cache, and the answer says how old the read side's data may be.
 */
export async function trailOf(
  sequelize: Sequelize,
  serial: string,
  read: ReadSide = primaryOnly(sequelize),
): Promise<TrailJson> {
  const [item, ref, readFrom] = await Promise.all([
    itemBySerial(read, serial),
    referenceData(sequelize),
    freshnessOf(read),
  ]);
  const links = await linksAround(read, item.id);
  const ids = [...new Set([item.id, ...links.flatMap((l) => [l.parent_item_id, l.child_item_id])])];
  // the items and every result among them at once; results outside the tree are dropped below
  const [items, allResults] = await Promise.all([
    selectModels(read, Item, 'id IN (:ids)', { ids }),
    selectModels(read, StageResult, 'item_id IN (:ids)', { ids }, 'finished_at, id'),
  ]);
  const byId = new Map(items.map((i) => [i.id, i]));
  const { tree, top, live } = genealogyTree(item, links, byId, ref);
  const inTree = itemsInTree(tree, items);
  const results = allResults.filter((r) => inTree.has(r.itemId));

  // everything else at once: the records around the results, NCRs (then their timelines), lots,
  // the shipment, the item's own card and the unit's field actions
  const [records, ncrs, lots, shipped, card, fieldActions] = await Promise.all([
    loadResultRecords(results, items, { ref, read }),
    ncrsOfTree(read, [...inTree], top.id),
    lotsOfUnit(read, top.id),
    selectModels(read, Shipment, 'unit_item_id = :top', { top: top.id }, 'id DESC LIMIT 1').then(([s]) =>
      s ? presentShipment(s) : null,
    ),
    presentItem(item, { ref, genealogy: { links: live, items } }),
    top.kind === 'long_block'
      ? listFieldActions(read.db, { unitId: top.id, page: 1, pageSize: 200 }).then((p) => p.rows)
      : [],
  ]);
  return {
    item: card,
    tree,
    lots: presentTrailLots(lots),
    results: presentTrailResults(results, byId, records),
    ncrs: presentTrailNcrs(ncrs, byId),
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
