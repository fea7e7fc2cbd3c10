import type { Sequelize } from 'sequelize';
import { can } from '../../../shared/permissions.js';
import type { Role } from '../../../shared/roles.js';
import type { SearchHit, SearchJson, SearchKind } from '../../../shared/schemas/line.js';
import { PART_KIND_LABELS } from '../../../shared/schemas/reference.js';
import { readQuery } from '../../read/read-query.js';

/**
 * One box for everything with a number: a fragment of a serial, a lot code, a customer's
 * reference (the core's return reference or the shipment's order), an NCR number or a casting
 * number, matched anywhere in the text and in any case. The trigram indexes of migration
 * 20261203170000 serve `ILIKE '%…%'`; each kind shows only to a role that may open it.
 */
const PER_KIND = 8;

export const escapeLike = (q: string) => `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;

type Group = {
  kind: SearchKind;
  label: string;
  allowed: (role: Role) => boolean;
  sql: string;
  hit: (r: Record<string, string | null>) => SearchHit;
};

const enc = encodeURIComponent;

const GROUPS: Group[] = [
  {
    kind: 'item',
    label: 'Serials',
    allowed: (r) => can(r, 'items.read'),
    sql: `SELECT i.serial, i.kind, i.status, f.code AS family
            FROM items i JOIN engine_families f ON f.id = i.engine_family_id
           WHERE i.serial ILIKE :like ORDER BY (upper(i.serial) = upper(:q)) DESC, length(i.serial), i.serial LIMIT :limit`,
    hit: (r) => ({
      kind: 'item',
      title: r.serial!,
      detail: `${PART_KIND_LABELS[r.kind as keyof typeof PART_KIND_LABELS] ?? r.kind} · ${r.family} · ${r.status!.replace(/_/g, ' ')}`,
      link: r.kind === 'core' ? `/cores/${enc(r.serial!)}` : `/items/${enc(r.serial!)}`,
    }),
  },
  {
    kind: 'core',
    label: 'Cores by casting number or customer reference',
    allowed: (r) => can(r, 'intake.read'),
    sql: `SELECT i.serial, cr.casting_number, cr.source_reference, to_char(cr.received_on, 'YYYY-MM-DD') AS received_on
            FROM core_receipts cr JOIN items i ON i.id = cr.item_id
           WHERE cr.casting_number ILIKE :like OR cr.source_reference ILIKE :like
           ORDER BY cr.received_on DESC, cr.id DESC LIMIT :limit`,
    hit: (r) => ({
      kind: 'core',
      title: r.serial!,
      detail: `casting ${r.casting_number}${r.source_reference ? ` · reference ${r.source_reference}` : ''} · received ${r.received_on}`,
      link: `/cores/${enc(r.serial!)}`,
    }),
  },
  {
    kind: 'lot',
    label: 'Lots',
    allowed: (r) => can(r, 'trail.read'),
    sql: `SELECT pl.lot_code, pl.part_number, pl.part_kind, s.name AS supplier
            FROM part_lots pl JOIN suppliers s ON s.id = pl.supplier_id
           WHERE pl.lot_code ILIKE :like ORDER BY pl.lot_code, pl.id LIMIT :limit`,
    hit: (r) => ({
      kind: 'lot',
      title: r.lot_code!,
      detail: `${r.part_kind!.replace(/_/g, ' ')} · ${r.part_number} · ${r.supplier}`,
      link: `/lots/${enc(r.lot_code!)}`,
    }),
  },
  {
    kind: 'ncr',
    label: 'NCRs',
    allowed: (r) => can(r, 'ncr.read'),
    sql: `SELECT n.number, n.state, left(n.description, 80) AS description
            FROM nonconformances n WHERE n.number ILIKE :like ORDER BY n.id DESC LIMIT :limit`,
    hit: (r) => ({
      kind: 'ncr',
      title: r.number!,
      detail: `${r.state!.replace(/_/g, ' ')} · ${r.description}`,
      link: `/ncrs/${enc(r.number!)}`,
    }),
  },
  {
    kind: 'shipment',
    label: 'Shipments by customer reference',
    allowed: (r) => can(r, 'trail.read'),
    sql: `SELECT sh.reference, i.serial, c.name AS customer, to_char(sh.ship_date, 'YYYY-MM-DD') AS ship_date
            FROM shipments sh JOIN items i ON i.id = sh.unit_item_id LEFT JOIN customers c ON c.id = sh.customer_id
           WHERE sh.reference ILIKE :like ORDER BY sh.shipped_at DESC, sh.id DESC LIMIT :limit`,
    hit: (r) => ({
      kind: 'shipment',
      title: r.reference!,
      detail: `${r.serial} · ${r.customer ?? ''} · shipped ${r.ship_date ?? ''}`,
      link: `/trail?serial=${enc(r.serial!)}`,
    }),
  },
];

export async function search(sequelize: Sequelize, role: Role, q: string): Promise<Omit<SearchJson, 'readFrom'>> {
  const groups = GROUPS.filter((g) => g.allowed(role));
  const found = await Promise.all(
    groups.map((g) =>
      readQuery<Record<string, string | null>>(sequelize, g.sql, { like: escapeLike(q), q, limit: PER_KIND + 1 }),
    ),
  );
  return {
    q,
    groups: groups
      .map((g, i) => ({
        kind: g.kind,
        label: g.label,
        hits: found[i]!.slice(0, PER_KIND).map(g.hit),
        more: found[i]!.length > PER_KIND,
      }))
      .filter((g) => g.hits.length > 0),
  };
}
