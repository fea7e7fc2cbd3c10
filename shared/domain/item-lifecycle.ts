/**
 * An item's life as data: the statuses a core, a part or a built unit can be in, and which moves
 * between them the product makes. The server moves items only through `moveItem`
 * (server/services/item-moves.ts), which refuses a move this table does not hold; the client reads
 * the same words.
 */
export const ITEM_STATUSES = [
  'received', // a core accepted at intake, not yet torn down
  'rejected', // a core refused at intake
  'in_stock', // a part harvested for which no route is in force
  'in_process', // a part or unit on its route
  'on_hold', // held by an open NCR, a containment or a control-chart signal
  'finished', // through every required stage of its route
  'installed', // fitted into a unit
  'shipped', // a unit released to a customer
  'returned', // a unit back under a warranty claim, or a part taken out of one
  'torn_down', // a core or a returned unit taken apart
  'scrapped', // disposed of by an NCR
] as const;

export type ItemStatus = (typeof ITEM_STATUSES)[number];

export const isItemStatus = (s: string): s is ItemStatus => (ITEM_STATUSES as readonly string[]).includes(s);

/** Statuses after which a part has left the shop floor's stages for good (as a part). */
export const PAST_STAGES: readonly ItemStatus[] = ['finished', 'installed', 'shipped'];

/** Where an item may go from each status. A hold can come from anything not yet shipped. */
export const ITEM_MOVES: Record<ItemStatus, readonly ItemStatus[]> = {
  received: ['torn_down', 'on_hold'],
  rejected: ['on_hold'],
  in_stock: ['in_process', 'installed', 'on_hold'],
  in_process: ['in_process', 'finished', 'installed', 'shipped', 'on_hold'],
  // a hold ends where the item stood before it (kept on the NCR), or where its outcome sends it
  on_hold: [
    'received',
    'rejected',
    'in_stock',
    'in_process',
    'finished',
    'installed',
    'returned',
    'torn_down',
    'scrapped',
    'on_hold',
  ],
  finished: ['in_process', 'installed', 'shipped', 'on_hold'],
  installed: ['finished', 'returned', 'on_hold'],
  shipped: ['returned'],
  returned: ['torn_down', 'on_hold'],
  torn_down: ['on_hold'],
  scrapped: ['on_hold'],
};

export const mayMove = (from: string, to: ItemStatus): boolean => isItemStatus(from) && ITEM_MOVES[from].includes(to);
