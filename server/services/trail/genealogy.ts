import { QueryTypes } from 'sequelize';
import type { TrailNode } from '../../../shared/schemas/trail.js';
import { PART_KIND_LABELS, type PartKind } from '../../../shared/schemas/reference.js';
import type { Item } from '../../models/index.js';
import type { ReadSide } from '../../read-side.js';
import type { KnownLink } from '../items.js';
import type { Reference } from '../reference-cache.js';

export type Link = KnownLink & {
  link_type: 'harvested_from' | 'installed_in';
  created_at: Date;
  removed_at: Date | null;
  removed_reason: string | null;
};

/**
 * Every link around an item, up to a core's parts' units and a unit's parts' cores: the links are
 * gathered as the walk follows them (index scans only), never by scanning item_links for links
 * among the items found, which grew with the plant's history. A part in a unit starts the walk at
 * its unit: the tree is the unit's, whose other parts may come from other cores, three links away
 * from this part. A part taken out of a unit keeps its ended link: the history of what was in the
 * unit, and when, stays in the tree.
 */
export function linksAround(read: ReadSide, itemId: number) {
  return read.db.query<Link>(
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
    { type: QueryTypes.SELECT, replacements: { id: itemId } },
  );
}

/**
 * The tree the trail shows for `item`: its unit and every part ever fitted (in the order they went
 * in, with their cores), or a core and its parts (with the units they went into), or a part in no
 * unit with its core and any unit it was taken out of. `top` is the unit when there is one.
 */
export function genealogyTree(item: Item, links: Link[], byId: Map<number, Item>, ref: Reference) {
  const live = links.filter((l) => !l.removed_at);
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
  const unitId = item.kind === 'long_block' ? item.id : installedIn(item.id)?.parent_item_id;
  const top = byId.get(unitId ?? item.id)!;
  if (unitId) {
    // every part that was ever fitted, in the order it went in; one taken out says when and why
    const parts = links
      .filter((l) => l.link_type === 'installed_in' && l.parent_item_id === unitId)
      .sort((a, b) => new Date(a.created_at).getTime() - new Date(b.created_at).getTime() || a.id - b.id);
    const tree = node(
      top,
      null,
      parts.map((l) => node(byId.get(l.child_item_id)!, 'installed_in', coreOf(l.child_item_id), l)),
    );
    return { tree, top, live };
  }
  if (item.kind === 'core') {
    const parts = links.filter((l) => l.link_type === 'harvested_from' && l.parent_item_id === item.id);
    const tree = node(
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
    return { tree, top, live };
  }
  // a part in no unit now: its core, and any unit it was taken out of
  const former = links.filter((l) => l.link_type === 'installed_in' && l.child_item_id === item.id);
  const tree = node(item, null, [
    ...coreOf(item.id),
    ...former.map((l) => node(byId.get(l.parent_item_id)!, 'installed_in', [], l)),
  ]);
  return { tree, top, live };
}

/** The items whose records the trail shows: the tree's, but not a unit a part was taken out of (that unit's own trail). */
export function itemsInTree(tree: TrailNode, items: Item[]) {
  const ids = new Set<number>();
  const walk = (n: TrailNode) => {
    if (n.kind === 'long_block' && n.removedAt) return;
    const i = items.find((x) => x.serial === n.serial);
    if (i) ids.add(i.id);
    n.children.forEach(walk);
  };
  walk(tree);
  return ids;
}
