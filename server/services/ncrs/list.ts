import { QueryTypes, type Sequelize } from 'sequelize';
import { type NcrListQuery, type NcrRow } from '../../../shared/schemas/ncr.js';

// ——— reading ———

// only the serial can be empty (an NCR on a lot); the others keep a plain order, which lets the
// (state, created_at) index hand the newest rows over without sorting every NCR first
const SORT: Record<NcrListQuery['sort'], string> = {
  raised: 'n.created_at',
  number: 'n.number',
  severity: "array_position(ARRAY['critical','major','minor']::varchar[], n.severity)",
  state: "array_position(ARRAY['raised','in_review','decided','closed','voided']::varchar[], n.state)",
  serial: 'i.serial',
};

/** The NCR list's two statements for a query, with their replacements; the benchmark runs them too. */
export function ncrListSql(q: NcrListQuery, { all = false, me = 0 }: { all?: boolean; me?: number } = {}) {
  const where: string[] = [];
  const r: Record<string, unknown> = {};
  const add = (sql: string, key?: string, value?: unknown) => {
    where.push(sql);
    if (key) r[key] = value;
  };
  if (q.state === 'open') add(`n.state IN ('raised','in_review','decided')`);
  else if (q.state) add('n.state = :state', 'state', q.state);
  if (q.severity) add('n.severity = :severity', 'severity', q.severity);
  if (q.defect) add('d.code = :defect', 'defect', q.defect.toUpperCase());
  if (q.family) add('i.engine_family_id = :family', 'family', q.family);
  if (q.stage) add('s.code = :stage', 'stage', q.stage);
  if (q.olderThanDays !== undefined) add('n.created_at <= now() - make_interval(days => :age)', 'age', q.olderThanDays);
  if (q.awaiting === 'me') {
    // signed once by someone else, waiting for a second quality engineer
    add(`n.state = 'in_review' AND n.awaiting_second_signature AND n.decided_by_id <> :me`, 'me', me);
  }
  if (q.assignee === 'none') add('n.assignee_id IS NULL');
  else if (q.assignee) add('n.assignee_id = :assignee', 'assignee', q.assignee);
  if (q.q) {
    // serials match however they were typed: case, dashes and spaces do not matter
    where.push(
      "(n.number ILIKE :q OR i.serial ILIKE :q OR replace(i.serial, '-', '') ILIKE :qc OR pl.lot_code ILIKE :q OR n.description ILIKE :q)",
    );
    r.q = `%${q.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    r.qc = `%${q.q.replace(/[^A-Za-z0-9]/g, '') || '-'}%`;
  }
  const filter = where.length ? `WHERE ${where.join(' AND ')}` : '';
  const from = `FROM nonconformances n
    LEFT JOIN items i ON i.id = n.item_id
    LEFT JOIN engine_families f ON f.id = i.engine_family_id
    LEFT JOIN stages s ON s.id = n.stage_id
    LEFT JOIN defect_codes d ON d.id = n.defect_code_id
    LEFT JOIN part_lots pl ON pl.id = n.part_lot_id
    JOIN users ru ON ru.id = n.raised_by_id
    LEFT JOIN users au ON au.id = n.assignee_id`;
  const dir = q.dir === 'asc' ? 'ASC' : 'DESC';
  return {
    rows: `SELECT n.number, n.state, n.severity, pl.lot_code AS "lotCode",
              n.awaiting_second_signature AS "awaitingSecondSignature", n.assignee_id AS "assigneeId",
              i.serial, i.kind AS "itemKind", f.code AS "familyCode",
              s.code AS "stageCode", s.name AS "stageName", d.code AS "defectCode", n.description,
              n.disposition, ru.name AS "raisedBy", au.name AS assignee,
              to_char(n.created_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS"Z"') AS "raisedAt",
              (extract(epoch FROM now() - n.created_at) / 86400)::int AS "ageDays"
         ${from} ${filter} ORDER BY ${SORT[q.sort]} ${dir}${q.sort === 'serial' ? ' NULLS LAST' : ''}, n.id ${dir}
         ${all ? '' : 'LIMIT :limit OFFSET :offset'}`,
    count: `SELECT count(*)::int AS n ${from} ${filter}`,
    replacements: { ...r, limit: q.pageSize, offset: (q.page - 1) * q.pageSize },
  };
}

/** The NCR list: filtered, sorted and paged in SQL. */
export async function listNcrs(sequelize: Sequelize, q: NcrListQuery, { all = false, me = 0 } = {}) {
  const sql = ncrListSql(q, { all, me });
  const [rows, [count]] = await Promise.all([
    sequelize.query<NcrRow>(sql.rows, { type: QueryTypes.SELECT, replacements: sql.replacements }),
    sequelize.query<{ n: number }>(sql.count, { type: QueryTypes.SELECT, replacements: sql.replacements }),
  ]);
  return { rows, total: count?.n ?? 0, page: q.page, pageSize: q.pageSize };
}
