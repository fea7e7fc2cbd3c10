import type { TrailJson, TrailNcr, TrailResult } from '../../../shared/schemas/trail.js';
import type { NcrState } from '../../../shared/schemas/ncr.js';
import type { Item, Signature, StageResult } from '../../models/index.js';
import { ncrTimeline } from '../ncr-timeline.js';
import type { loadResultRecords } from '../result-records.js';
import { presentSignature } from '../signatures.js';
import type { LotRow, NcrRow, TransitionRow } from './records.js';

type Records = Awaited<ReturnType<typeof loadResultRecords>>;

/** Each result of the tree with its stage, station, operator, gauge, readings and photos. */
export function presentTrailResults(results: StageResult[], byId: Map<number, Item>, records: Records): TrailResult[] {
  return results.map((r) => {
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
}

/** Each NCR with its timeline of transitions and signatures. */
export function presentTrailNcrs(
  { ncrs, transitions, signatures }: { ncrs: NcrRow[]; transitions: TransitionRow[]; signatures: Signature[] },
  byId: Map<number, Item>,
): TrailNcr[] {
  return ncrs.map((n) => {
    const signed = signatures.filter((s) => s.entityId === n.number);
    return {
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
        signed,
      ),
      signatures: signed.map(presentSignature),
    };
  });
}

export const presentTrailLots = (lots: LotRow[]): TrailJson['lots'] =>
  lots.map((l) => ({
    kind: l.kind,
    supplier: l.supplier,
    partNumber: l.part_number,
    lotCode: l.lot_code,
    quantity: l.quantity,
    attributes: l.attributes,
    sizeClass: l.size_class,
    matchedTo: l.matched_to,
  }));
