import type pg from 'pg';
import { sqlText } from './pgbench.js';

/**
 * The station-result transaction as PostgreSQL alone would run it: the statements the API sends for
 * one passing submission (copied from the server's statement log, in the same order, with the same
 * row locks, the same two audit events — plain inserts, queued for the Merkle log by the same trigger,
 * with no lock and no read of an earlier event — and the same stored reply; the benchmark prints both
 * statement counts so a drift shows), with the values of one real submission (`sampleResultId`) as
 * literals. What the raw side leaves out is exactly what the API adds: HTTP, zod, judging the
 * readings and JSON in JavaScript. The sequencer that integrates both sides' events runs in the API
 * process throughout.
 *
 * Before the transaction, one statement picks the next part from `bench_raw_parts` — the API's
 * load driver does that on its side.
 */
export async function rawWriteScript(db: pg.Pool, sampleResultId: number) {
  const { rows: readings } = await db.query<Record<string, unknown>>(
    `SELECT characteristic_id, position, value, passed, location_note, unit, verdict, tolerance_rule_id, rule_version,
            gauge_id FROM readings WHERE stage_result_id = $1 ORDER BY id`,
    [sampleResultId],
  );
  const {
    rows: [result],
  } = await db.query<{ idempotency_key: string; stage_id: number; station_id: number; gauge_id: number | null }>(
    'SELECT idempotency_key, stage_id, station_id, gauge_id FROM stage_results WHERE id = $1',
    [sampleResultId],
  );
  if (!result) throw new Error(`no sample result ${sampleResultId}`);
  const { rows: events } = await db.query<{ action: string; entity: string; before: unknown; after: unknown }>(
    `SELECT action, entity, before::text AS before, after::text AS after FROM audit_events
      WHERE (entity = 'stage_result' AND entity_id = $1::text) OR (entity = 'item' AND after->>'byResult' = $1::text)
      ORDER BY id`,
    [sampleResultId],
  );
  const {
    rows: [reply],
  } = await db.query<{ request_hash: string; response: string }>(
    'SELECT request_hash, response::text AS response FROM idempotency_keys WHERE key = $1',
    [result.idempotency_key],
  );
  const {
    rows: [ctx],
  } = await db.query<{ next_stage: number }>(
    `SELECT rs2.stage_id AS next_stage FROM route_stages rs
       JOIN route_stages rs2 ON rs2.route_id = rs.route_id AND rs2.position = rs.position + 1
       JOIN routes r ON r.id = rs.route_id AND r.part_kind = 'block' AND r.active
      WHERE rs.stage_id = $1 LIMIT 1`,
    [result.stage_id],
  );
  if (!reply || !ctx || events.length !== 2) throw new Error('the sample submission is incomplete');
  const lit = (v: unknown) => (v === null || v === undefined ? 'NULL' : typeof v === 'string' ? sqlText(v) : String(v));
  const values = readings
    .map(
      (r) =>
        `(:r_id,${r.characteristic_id},${lit(r.position)},${lit(r.value)},${lit(r.passed)},${lit(r.location_note)},` +
        `${lit(r.unit)},${lit(r.verdict)},${lit(r.tolerance_rule_id)},${lit(r.rule_version)},${lit(r.gauge_id)})`,
    )
    .join(',');
  const audit = (e: (typeof events)[number]) =>
    `INSERT INTO audit_events (occurred_at, actor_id, actor_role, action, entity, entity_id, before, after, request_id) VALUES (now(),:uid,'operator',${lit(e.action)},${lit(e.entity)},${e.entity === 'item' ? "':serial'" : "':r_id'"},${lit(e.before)},${lit(e.after)},':key');`;
  const script = `SELECT item_id, serial FROM bench_raw_parts WHERE slot = (SELECT nextval('bench_raw_seq') % :pool) \\gset
SELECT gen_random_uuid() AS key \\gset
SELECT s.id AS session_id, s.revoked_at, s.expires_at, s.token_version AS session_tv, u.id, u.email, u.name, u.role, u.active, u.token_version AS user_tv FROM sessions s JOIN users u ON u.id = s.user_id WHERE s.id = ':sid';
START TRANSACTION;
SELECT pg_advisory_xact_lock(hashtextextended(':key', 7241)) AS locked, v.* FROM (SELECT version, xmin::text = (txid_current_if_assigned() % 4294967296)::text AS mine FROM reference_version) v;
SELECT "key", "user_id" AS "userId", "method", "path", "request_hash" AS "requestHash", "status_code" AS "statusCode", "response", "created_at" AS "createdAt" FROM "idempotency_keys" AS "IdempotencyKey" WHERE "IdempotencyKey"."key" = ':key';
SELECT to_char(q.expires_on, 'YYYY-MM-DD') AS expires_on, q.withdrawn_at IS NOT NULL AS withdrawn, (SELECT time_zone FROM plant_settings WHERE id = 1) AS tz, u.name FROM users u LEFT JOIN LATERAL (SELECT expires_on, withdrawn_at FROM qualifications WHERE user_id = u.id AND stage_id = ${result.stage_id} ORDER BY id DESC LIMIT 1) q ON true WHERE u.id = :uid;
SELECT u.id, u.serial, u.status FROM items u WHERE u.id IN (SELECT i.id FROM items i WHERE i.id = (SELECT id FROM items WHERE serial = ':serial') AND i.kind = 'long_block' UNION SELECT l.parent_item_id FROM item_links l WHERE l.child_item_id = (SELECT id FROM items WHERE serial = ':serial') AND l.link_type = 'installed_in' AND l.removed_at IS NULL UNION SELECT l.parent_item_id FROM item_links h JOIN item_links l ON l.child_item_id = h.child_item_id AND l.link_type = 'installed_in' AND l.removed_at IS NULL WHERE h.parent_item_id = (SELECT id FROM items WHERE serial = ':serial') AND h.link_type = 'harvested_from' AND h.removed_at IS NULL) ORDER BY u.id FOR UPDATE OF u;
SELECT "id", "serial", "kind", "engine_family_id" AS "engineFamilyId", "status", "route_id" AS "routeId", "current_stage_id" AS "currentStageId", "position_label" AS "positionLabel", "attributes", "created_by_id" AS "createdById", "created_at" AS "createdAt", "updated_at" AS "updatedAt" FROM "items" AS "Item" WHERE "Item"."serial" = ':serial' FOR UPDATE;
SELECT "id", "number", "item_id" AS "itemId", "part_lot_id" AS "partLotId", "stage_result_id" AS "stageResultId", "stage_id" AS "stageId", "defect_code_id" AS "defectCodeId", "severity", "state", "description", "failing", "containment", "disposition", "disposition_reason" AS "dispositionReason", "rework_stage_id" AS "reworkStageId", "raised_by_id" AS "raisedById", "assignee_id" AS "assigneeId", "closed_at" AS "closedAt", "item_status_before" AS "itemStatusBefore", "awaiting_second_signature" AS "awaitingSecondSignature", "decided_by_id" AS "decidedById", "decided_at" AS "decidedAt", "created_at" AS "createdAt", "updated_at" AS "updatedAt" FROM "nonconformances" AS "Nonconformance" WHERE "Nonconformance"."state" IN ('raised', 'in_review', 'decided') AND "Nonconformance"."item_id" = :item_id ORDER BY "Nonconformance"."id" ASC;
SELECT "id", "item_id" AS "itemId", "stage_id" AS "stageId", "from_stage_id" AS "fromStageId", "from_status" AS "fromStatus", "reason", "allowed_by_id" AS "allowedById", "used_by_result_id" AS "usedByResultId", "created_at" AS "createdAt" FROM "stage_reentries" AS "StageReentry" WHERE "StageReentry"."item_id" = :item_id AND "StageReentry"."used_by_result_id" IS NULL LIMIT 1;
INSERT INTO "stage_results" ("id","item_id","stage_id","station_id","operator_id","gauge_id","started_at","finished_at","taken_at","verdict","idempotency_key","supersedes_id","correction_reason","reentry_reason","reentry_by_id","notes","tablet_id","size_classes","created_at") VALUES (DEFAULT,:item_id,${result.stage_id},${result.station_id},:uid,${lit(result.gauge_id)},NULL,now(),now(),'pass',':key',NULL,NULL,NULL,NULL,'',NULL,'{}',now()) RETURNING "id","item_id","stage_id","station_id","operator_id","gauge_id","started_at","finished_at","taken_at","verdict","idempotency_key","supersedes_id","correction_reason","reentry_reason","reentry_by_id","notes","tablet_id","size_classes","created_at" \\gset r_
INSERT INTO "readings" ("stage_result_id","characteristic_id","position","value","passed","location_note","unit","verdict","tolerance_rule_id","rule_version","gauge_id") VALUES ${values};
UPDATE "items" SET "current_stage_id"=${ctx.next_stage},"updated_at"=now() WHERE "id" = :item_id;
SELECT "id", "number", "item_id" AS "itemId", "part_lot_id" AS "partLotId", "stage_result_id" AS "stageResultId", "stage_id" AS "stageId", "defect_code_id" AS "defectCodeId", "severity", "state", "description", "failing", "containment", "disposition", "disposition_reason" AS "dispositionReason", "rework_stage_id" AS "reworkStageId", "raised_by_id" AS "raisedById", "assignee_id" AS "assigneeId", "closed_at" AS "closedAt", "item_status_before" AS "itemStatusBefore", "awaiting_second_signature" AS "awaitingSecondSignature", "decided_by_id" AS "decidedById", "decided_at" AS "decidedAt", "created_at" AS "createdAt", "updated_at" AS "updatedAt" FROM "nonconformances" AS "Nonconformance" WHERE "Nonconformance"."state" = 'decided' AND "Nonconformance"."disposition" IN ('rework', 'repair') AND "Nonconformance"."item_id" = :item_id AND "Nonconformance"."rework_stage_id" = ${result.stage_id} FOR UPDATE;
INSERT INTO "idempotency_keys" ("key","user_id","method","path","request_hash","status_code","response","created_at") VALUES (':key',:uid,'POST','/api/results',${lit(reply.request_hash)},201,${lit(reply.response)},now());
${audit(events[0]!)}
${audit(events[1]!)}
COMMIT;
`;
  // statements per transaction, for the report: every line but the part pick and the key
  const statements = script
    .split('\n')
    .filter((l) => l.trim() && !l.startsWith('SELECT item_id') && !l.startsWith('SELECT gen_random_uuid')).length;
  return { script, statements, readings: readings.length };
}
