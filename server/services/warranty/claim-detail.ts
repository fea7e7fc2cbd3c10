import { Op, QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { PART_KIND_LABELS, type PartKind } from '../../../shared/schemas/reference.js';
import type {
  BuiltResult,
  ClaimJson,
  ClaimPart,
  ClaimState,
  FindingJson,
  MeasurementJson,
} from '../../../shared/schemas/warranty.js';
import { notFound } from '../../errors.js';
import {
  Attachment,
  CauseCode,
  Customer,
  EngineFamily,
  Item,
  Shipment,
  Signature,
  StageResult,
  WarrantyClaim,
  WarrantyFinding,
} from '../../models/index.js';
import { presentAttachment } from '../attachments.js';
import { groupBy } from '../group-by.js';
import { plantSettings } from '../plant.js';
import { referenceData } from '../reference-cache.js';
import { loadResultRecords } from '../result-records.js';
import { presentSignature } from '../signatures.js';
import { daysBetween, nextStep, shipDateOf } from './common.js';
import { namesOf } from './people.js';
import { presentCause } from './cause-codes.js';
import { readsTogether } from '../../read/reads-together.js';

/**
 * One claim as its page shows it: the facts, the coverage as it was said, every signed step, and
 * each teardown finding beside what was measured on that part when it was built — its readings
 * with the rule versions, gauges, stations and operators, read through the same loader as the
 * trail. A finding on a purchased lot sits beside the unit's own stages, where those parts went in.
 */

type Fitted = { item_id: number; serial: string; kind: PartKind; position_label: string | null; core: string | null };

/** What was in the unit when it shipped: the parts fitted then (taken out since or not), and the unit. */
export async function partsAtShipment(sequelize: Sequelize, unitId: number, shipmentId: number, t?: Transaction) {
  return sequelize.query<Fitted>(
    `SELECT i.id AS item_id, i.serial, i.kind, i.position_label, c.serial AS core
       FROM items i
       LEFT JOIN item_links h ON h.child_item_id = i.id AND h.link_type = 'harvested_from' AND h.removed_at IS NULL
       LEFT JOIN items c ON c.id = h.parent_item_id
      WHERE i.id = :unitId
         OR i.id IN (SELECT l.child_item_id FROM item_links l JOIN shipments s ON s.id = :shipmentId
                      WHERE l.parent_item_id = :unitId AND l.link_type = 'installed_in'
                        AND l.created_at <= s.shipped_at AND (l.removed_at IS NULL OR l.removed_at > s.shipped_at))
      ORDER BY (i.id = :unitId) DESC, i.id`,
    { type: QueryTypes.SELECT, replacements: { unitId, shipmentId }, transaction: t },
  );
}

export async function lotsOfUnit(sequelize: Sequelize, unitId: number, t?: Transaction) {
  return sequelize.query<{ id: number; lot_code: string; kind: string; supplier: string; part_number: string }>(
    `SELECT pl.id, pl.lot_code, pl.part_kind AS kind, s.name AS supplier, pl.part_number
       FROM unit_lots ul JOIN part_lots pl ON pl.id = ul.part_lot_id JOIN suppliers s ON s.id = pl.supplier_id
      WHERE ul.unit_item_id = :unitId ORDER BY ul.id`,
    { type: QueryTypes.SELECT, replacements: { unitId }, transaction: t },
  );
}

/** Every result of these items with its readings, and per item the characteristics measured on it. */
export async function builtRecords(sequelize: Sequelize, itemIds: number[], t?: Transaction) {
  const [items, results, ref] = await readsTogether(t, [
    () => Item.findAll({ where: { id: { [Op.in]: itemIds } }, transaction: t }),
    () =>
      StageResult.findAll({
        where: { itemId: { [Op.in]: itemIds } },
        order: [
          ['finishedAt', 'ASC'],
          ['id', 'ASC'],
        ],
        transaction: t,
      }),
    () => referenceData(sequelize, t),
  ]);
  const records = await loadResultRecords(results, items, { ref });
  const byItem = groupBy(results, (r) => r.itemId);
  const built = (itemId: number): BuiltResult[] =>
    (byItem.get(itemId) ?? []).map((r) => ({
      stage: { code: records.stage(r).code, name: records.stage(r).name },
      station: records.station(r)?.code ?? null,
      operator: records.name(r.operatorId),
      gauge: records.gauge(r),
      verdict: r.verdict,
      finishedAt: r.finishedAt.toISOString(),
      superseded: records.supersededBy(r) !== null,
      readings: records.readings(r).map(({ kind: _k, ruleId: _r, ...x }) => x),
    }));
  const characteristics = (itemId: number): ClaimPart['characteristics'] => {
    const out = new Map<string, ClaimPart['characteristics'][number]>();
    for (const r of built(itemId)) {
      if (r.superseded) continue;
      for (const x of r.readings) {
        if (x.value === null) continue; // a pass/fail check has nothing to measure again
        const c = out.get(x.characteristic) ?? { code: x.characteristic, name: x.name, unit: x.unit, positions: [] };
        if (!c.positions.some((p) => p.code === x.position))
          c.positions.push({ code: x.position, label: x.positionLabel });
        out.set(x.characteristic, c);
      }
    }
    return [...out.values()];
  };
  return { built, characteristics };
}

export async function claimDetail(sequelize: Sequelize, number: string, t?: Transaction): Promise<ClaimJson> {
  const claim = await WarrantyClaim.findOne({ where: { number }, transaction: t });
  if (!claim) throw notFound(`Claim ${number}`);
  const d = await loadClaim(sequelize, claim, t);
  const { unit, shipment, customer, family, fitted, lots, records, name } = d;
  const shipDate = shipDateOf(shipment, d.plant.timeZone);
  const returned = claim.unitReturnedAt !== null;
  return {
    number: claim.number,
    state: claim.state as ClaimState,
    demo: claim.demo,
    unit: { serial: unit.serial, familyCode: family.code, familyName: family.name, status: unit.status },
    shipment: { reference: shipment.reference, shipDate, customer: d.shipCustomer?.name ?? null },
    customer: customer.name,
    customerId: customer.id,
    customerReference: claim.customerReference,
    failedOn: claim.failedOn,
    distanceKm: claim.distanceKm,
    hours: claim.hours === null ? null : Number(claim.hours),
    symptom: claim.symptom,
    installer: claim.installer,
    covered: claim.covered,
    coverage: { covered: claim.covered, reason: claim.coverageReason, endsOn: claim.warrantyEndsOn },
    daysInService: daysBetween(shipDate, claim.failedOn),
    decision: claim.decision,
    unitReturned: returned,
    next: nextStep(claim.state as ClaimState, returned),
    openedAt: claim.createdAt.toISOString(),
    openedBy: name(claim.openedById) ?? '',
    unitReturnedAt: claim.unitReturnedAt?.toISOString() ?? null,
    returnedBy: name(claim.returnedById),
    tornDownAt: claim.tornDownAt?.toISOString() ?? null,
    tornDownBy: name(claim.tornDownById),
    teardownNotes: claim.teardownNotes,
    decisionReason: claim.decisionReason,
    decidedBy: name(claim.decidedById),
    decidedAt: claim.decidedAt?.toISOString() ?? null,
    closedBy: name(claim.closedById),
    closedAt: claim.closedAt?.toISOString() ?? null,
    parts: fitted.map((p) => ({
      serial: p.serial,
      kind: p.kind,
      kindLabel: PART_KIND_LABELS[p.kind],
      positionLabel: p.position_label,
      characteristics: records.characteristics(p.item_id),
    })),
    lots: lots.map((l) => ({ lotCode: l.lot_code, kind: l.kind, supplier: l.supplier, partNumber: l.part_number })),
    findings: d.findings.map(findingPresenter(d)),
    signatures: d.signatures.map(presentSignature),
    correctiveActions: d.cas,
  };
}

type Loaded = Awaited<ReturnType<typeof loadClaim>>;

/** Everything the claim's page shows, in three rounds of reads. */
async function loadClaim(sequelize: Sequelize, claim: WarrantyClaim, t?: Transaction) {
  const number = claim.number;
  const [unit, shipment, customer, findings, signatures, plant, cas] = await readsTogether(t, [
    () => Item.findByPk(claim.unitItemId, { transaction: t }),
    () => Shipment.findByPk(claim.shipmentId, { transaction: t }),
    () => Customer.findByPk(claim.customerId, { transaction: t }),
    () => WarrantyFinding.findAll({ where: { claimId: claim.id }, order: [['id', 'ASC']], transaction: t }),
    () =>
      Signature.findAll({
        where: { entity: 'warranty_claim', entityId: number },
        order: [['id', 'ASC']],
        transaction: t,
      }),
    () => plantSettings(t),
    () =>
      sequelize.query<{ number: string; title: string; state: 'open' | 'closed' }>(
        `SELECT ca.number, ca.title, ca.state FROM corrective_action_sources s
         JOIN corrective_actions ca ON ca.id = s.corrective_action_id
        WHERE s.warranty_claim_id = :id ORDER BY ca.id`,
        { type: QueryTypes.SELECT, replacements: { id: claim.id }, transaction: t },
      ),
  ]);
  const family = (await EngineFamily.findByPk(unit!.engineFamilyId, { transaction: t }))!;
  const [fitted, lots, causes, photos, shipCustomer, name] = await readsTogether(t, [
    () => partsAtShipment(sequelize, unit!.id, shipment!.id, t),
    () => lotsOfUnit(sequelize, unit!.id, t),
    () => CauseCode.findAll({ where: { id: { [Op.in]: [0, ...findings.map((f) => f.causeCodeId)] } }, transaction: t }),
    () =>
      findings.length
        ? Attachment.findAll({
            where: { entity: 'warranty_finding', entityId: { [Op.in]: findings.map((f) => String(f.id)) } },
            order: [['id', 'ASC']],
            transaction: t,
          })
        : [],
    () => (shipment!.customerId ? Customer.findByPk(shipment!.customerId, { transaction: t }) : null),
    () =>
      namesOf(
        [
          claim.openedById,
          claim.returnedById,
          claim.tornDownById,
          claim.decidedById,
          claim.closedById,
          ...findings.map((f) => f.recordedById),
        ],
        t,
      ),
  ]);
  const records = await builtRecords(
    sequelize,
    fitted.map((p) => p.item_id),
    t,
  );
  return {
    unit: unit!,
    shipment: shipment!,
    customer: customer!,
    family,
    findings,
    signatures,
    plant,
    cas,
    fitted,
    lots,
    causes,
    photos,
    shipCustomer,
    name,
    records,
  };
}

/** A finding beside what was measured on its part (or, for a lot, on the unit) when it was built. */
function findingPresenter(d: Loaded) {
  const { unit, records, name } = d;
  const causeById = new Map(d.causes.map((c) => [c.id, c]));
  const photosOf = groupBy(d.photos, (p) => p.entityId);
  const fittedById = new Map(d.fitted.map((p) => [p.item_id, p]));
  const lotById = new Map(d.lots.map((l) => [l.id, l]));
  return (f: WarrantyFinding): FindingJson => {
    const part = f.itemId ? fittedById.get(f.itemId) : undefined;
    const lot = f.partLotId ? lotById.get(f.partLotId) : undefined;
    const subjectId = part ? part.item_id : unit.id;
    const chars = new Map(records.characteristics(subjectId).map((c) => [c.code, c]));
    const measurements: MeasurementJson[] = (f.measurements ?? []).map((m) => {
      const c = chars.get(m.characteristic);
      return {
        characteristic: m.characteristic,
        name: c?.name ?? m.characteristic,
        position: m.position,
        positionLabel: c?.positions.find((p) => p.code === m.position)?.label ?? m.position,
        value: m.value,
        unit: m.unit,
      };
    });
    return {
      id: f.id,
      subject: part
        ? {
            kind: 'item',
            serial: part.serial,
            kindLabel: PART_KIND_LABELS[part.kind],
            positionLabel: part.position_label,
            core: part.core,
          }
        : {
            kind: 'lot',
            lotCode: lot?.lot_code ?? '',
            partKind: lot?.kind ?? '',
            supplier: lot?.supplier ?? '',
            partNumber: lot?.part_number ?? '',
          },
      cause: presentCause(causeById.get(f.causeCodeId)!),
      description: f.description,
      measurements,
      photos: (photosOf.get(String(f.id)) ?? []).map(presentAttachment),
      recordedBy: name(f.recordedById) ?? '',
      recordedAt: f.createdAt.toISOString(),
      built: records.built(subjectId),
    };
  };
}
