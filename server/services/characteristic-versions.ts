import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import {
  DEFINITION_FIELDS,
  type CharacteristicChangeBody,
  type CharacteristicCompareJson,
  type CharacteristicDefinition,
  type CharacteristicVersionJson,
} from '../../shared/schemas/characteristic-versions.js';
import type { ApproveChangeBody } from '../../shared/schemas/process.js';
import { recordAudit, systemCtx, type Ctx } from '../audit.js';
import { conflict, forbidden, invalid, notFound } from '../errors.js';
import { Characteristic, CharacteristicVersion, DefectCode, User } from '../models/index.js';
import { signWithPassword } from './signatures.js';

/**
 * Changes to a characteristic under change control: a new version of its definition, drafted by one
 * person, approved with another's signature and in force from a time, when it is written onto the
 * characteristic (the stations read that row). Every version is kept and can be compared.
 */

const num = (v: unknown) => (v === null || v === undefined ? null : Number(v));

const definitionOf = (c: Characteristic): CharacteristicDefinition => ({
  name: c.name,
  critical: c.critical,
  optional: c.optional,
  help: c.help,
  gaugeKinds: c.gaugeKinds,
  defectCode: c.defectCode,
  physicalMin: num(c.physicalMin),
  physicalMax: num(c.physicalMax),
  matesWith: (c.matesWith ?? null) as CharacteristicDefinition['matesWith'],
});

const same = (a: unknown, b: unknown) => JSON.stringify(a) === JSON.stringify(b);

async function present(rows: CharacteristicVersion[], transaction?: Transaction): Promise<CharacteristicVersionJson[]> {
  const ids = [...new Set(rows.flatMap((r) => [r.createdById, r.approvedById]).filter((x): x is number => !!x))];
  const names = new Map(
    (await User.findAll({ where: { id: ids }, attributes: ['id', 'name'], transaction })).map((u) => [u.id, u.name]),
  );
  const current = new Map<number, number>();
  for (const r of rows) {
    if (r.status === 'approved' && r.appliedAt && r.version > (current.get(r.characteristicId) ?? 0)) {
      current.set(r.characteristicId, r.version);
    }
  }
  return rows.map((r) => ({
    id: r.id,
    characteristicId: r.characteristicId,
    version: r.version,
    status: r.status,
    inForce: current.get(r.characteristicId) === r.version,
    definition: r.definition,
    note: r.note,
    createdById: r.createdById ?? null,
    createdBy: r.createdById ? (names.get(r.createdById) ?? null) : null,
    approvedBy: r.approvedById ? (names.get(r.approvedById) ?? null) : null,
    approvedAt: r.approvedAt?.toISOString() ?? null,
    approvalReason: r.approvalReason,
    effectiveFrom: r.effectiveFrom?.toISOString() ?? null,
  }));
}

/** Writes an approved version onto its characteristic; the version applied before is superseded. */
async function apply(ctx: Ctx, v: CharacteristicVersion, transaction: Transaction) {
  const c = (await Characteristic.findByPk(v.characteristicId, { transaction, lock: transaction.LOCK.UPDATE }))!;
  const before = definitionOf(c);
  await c.update({ ...v.definition }, { transaction });
  const older = await CharacteristicVersion.findAll({
    where: { characteristicId: v.characteristicId, status: 'approved' },
    transaction,
  });
  for (const o of older) if (o.id !== v.id && o.appliedAt) await o.update({ status: 'superseded' }, { transaction });
  await v.update({ appliedAt: new Date() }, { transaction });
  await recordAudit(ctx, transaction, {
    action: 'characteristic.change_applied',
    entity: 'characteristic',
    entityId: c.id,
    before,
    after: { ...definitionOf(c), version: v.version },
  });
}

/** Applies approved versions whose time has come; a run with nothing due writes nothing. */
export async function settleCharacteristicVersions(sequelize: Sequelize): Promise<number> {
  const due = `SELECT id FROM characteristic_versions
                WHERE status = 'approved' AND applied_at IS NULL AND effective_from <= now() ORDER BY id`;
  if (!(await sequelize.query(due, { type: QueryTypes.SELECT })).length) return 0;
  return sequelize.transaction(async (transaction) => {
    const rows = await sequelize.query<{ id: number }>(`${due} FOR UPDATE`, { type: QueryTypes.SELECT, transaction });
    for (const r of rows)
      await apply(systemCtx(), (await CharacteristicVersion.findByPk(r.id, { transaction }))!, transaction);
    return rows.length;
  });
}

export async function characteristicVersions(id: number) {
  await settleCharacteristicVersions(Characteristic.sequelize!);
  const c = await Characteristic.findByPk(id);
  if (!c) throw notFound('That characteristic');
  const rows = await CharacteristicVersion.findAll({ where: { characteristicId: id }, order: [['version', 'DESC']] });
  return { current: definitionOf(c), versions: await present(rows) };
}

export async function compareCharacteristicVersions(a: number, b: number): Promise<CharacteristicCompareJson> {
  const rows = await CharacteristicVersion.findAll({ where: { id: [a, b] } });
  const [left, right] = [rows.find((r) => r.id === a), rows.find((r) => r.id === b)];
  if (!left || !right) throw notFound('That characteristic version');
  if (left.characteristicId !== right.characteristicId) {
    throw invalid('Compare two versions of the same characteristic.');
  }
  const [l, r] = await present([left, right]);
  return {
    left: l!,
    right: r!,
    rows: DEFINITION_FIELDS.map((field) => ({
      field,
      left: l!.definition[field],
      right: r!.definition[field],
      changed: !same(l!.definition[field], r!.definition[field]),
    })),
  };
}

/** Drafts the next version of a characteristic's definition: what the body names changes. */
export async function draftCharacteristicChange(
  sequelize: Sequelize,
  ctx: Ctx,
  id: number,
  body: CharacteristicChangeBody,
) {
  await settleCharacteristicVersions(sequelize);
  return sequelize.transaction(async (transaction) => {
    const c = await Characteristic.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!c) throw notFound('That characteristic');
    if (c.retiredAt) throw conflict(`${c.name} is retired: it cannot be changed.`);
    const { note, ...changes } = body;
    if (c.kind === 'derived') throw invalid(`${c.name} is worked out by Coretrail: its definition is in the code.`);
    const current = definitionOf(c);
    const definition: CharacteristicDefinition = { ...current, ...changes };
    const problems: Record<string, string> = {};
    if (
      definition.physicalMin !== null &&
      definition.physicalMax !== null &&
      definition.physicalMin >= definition.physicalMax
    ) {
      problems.physicalMax = 'The highest possible value is above the lowest.';
    }
    if (definition.defectCode && definition.defectCode !== current.defectCode) {
      const code = await DefectCode.findOne({ where: { code: definition.defectCode, active: true }, transaction });
      if (!code) problems.defectCode = `There is no defect code ${definition.defectCode} in use.`;
    }
    if (Object.keys(problems).length) throw invalid('The change cannot be drafted.', problems);
    if (same(definition, current)) throw invalid('Nothing changes: name at least one field with a new value.');
    const drafted = await CharacteristicVersion.findOne({
      where: { characteristicId: id, status: 'draft' },
      transaction,
    });
    if (drafted) {
      throw conflict(`Version ${drafted.version} of ${c.name} is already a draft: approve or discard it first.`, {
        draftId: drafted.id,
      });
    }
    let last = (await CharacteristicVersion.max('version', { where: { characteristicId: id }, transaction })) as
      number | null;
    if (!last) {
      // version 1: the definition as it stood before its first change, to compare against
      await CharacteristicVersion.create(
        {
          characteristicId: id,
          version: 1,
          status: 'approved',
          definition: current,
          note: 'As defined before its first change',
          createdById: null,
          effectiveFrom: c.createdAt,
          appliedAt: c.createdAt,
        },
        { transaction },
      );
      last = 1;
    }
    const v = await CharacteristicVersion.create(
      { characteristicId: id, version: last + 1, definition, note, createdById: ctx.actor!.id },
      { transaction },
    );
    await recordAudit(ctx, transaction, {
      action: 'characteristic.change_drafted',
      entity: 'characteristic',
      entityId: id,
      before: current,
      after: { ...definition, version: v.version, note },
    });
    return (await present([v], transaction))[0]!;
  });
}

async function lockedDraft(id: number, transaction: Transaction) {
  const v = await CharacteristicVersion.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
  if (!v) throw notFound('That characteristic version');
  if (v.status !== 'draft') throw conflict(`Version ${v.version} is ${v.status}, not a draft: it is never edited.`);
  return v;
}

export async function discardCharacteristicChange(sequelize: Sequelize, ctx: Ctx, id: number) {
  return sequelize.transaction(async (transaction) => {
    const v = await lockedDraft(id, transaction);
    await v.update({ status: 'discarded' }, { transaction });
    await recordAudit(ctx, transaction, {
      action: 'characteristic.change_discarded',
      entity: 'characteristic',
      entityId: v.characteristicId,
      before: { version: v.version, status: 'draft' },
      after: { version: v.version, status: 'discarded' },
    });
    return (await present([v], transaction))[0]!;
  });
}

/** Approves a drafted change with a signature (not its author's); applied now or at its time. */
export async function approveCharacteristicChange(
  sequelize: Sequelize,
  ctx: Ctx,
  id: number,
  input: ApproveChangeBody,
) {
  return sequelize.transaction(async (transaction) => {
    const v = await lockedDraft(id, transaction);
    if (v.createdById === ctx.actor!.id) throw forbidden('You drafted this change: someone else must approve it.');
    const now = new Date();
    const requested = input.effectiveFrom ? new Date(input.effectiveFrom) : now;
    if (requested.getTime() < now.getTime() - 60_000) {
      throw invalid('A change cannot take effect in the past.', { effectiveFrom: 'Choose now or a later time.' });
    }
    const effective = requested < now ? now : requested;
    const waiting = await CharacteristicVersion.findOne({
      where: { characteristicId: v.characteristicId, status: 'approved', appliedAt: null },
      transaction,
    });
    if (waiting) {
      throw conflict(
        `Version ${waiting.version} is already approved to take effect on ${waiting.effectiveFrom?.toISOString()}. Only one version can wait to take effect.`,
      );
    }
    const c = (await Characteristic.findByPk(v.characteristicId, { transaction }))!;
    const meaning = `Approved the change to ${c.name}, version ${v.version}`;
    const { user } = await signWithPassword(ctx, transaction, {
      entity: 'characteristic_version',
      entityId: String(v.id),
      meaning,
      reason: input.reason,
      password: input.password,
      refused: 'the change was not approved.',
    });
    await v.update(
      {
        status: 'approved',
        approvedById: user.id,
        approvedAt: now,
        approvalReason: input.reason,
        effectiveFrom: effective,
      },
      { transaction },
    );
    await recordAudit(ctx, transaction, {
      action: 'characteristic.change_approved',
      entity: 'characteristic',
      entityId: v.characteristicId,
      before: { version: v.version, status: 'draft' },
      after: {
        version: v.version,
        status: 'approved',
        effectiveFrom: effective.toISOString(),
        signature: { printedName: user.name, meaning, reason: input.reason, signedAt: now.toISOString() },
      },
    });
    if (effective.getTime() <= now.getTime()) await apply(ctx, v, transaction);
    return (await present([v], transaction))[0]!;
  });
}
