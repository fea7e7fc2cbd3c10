import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { todayIn } from '../../shared/domain/warranty.js';
import type {
  QualificationJson,
  QualificationMatrixJson,
  QualificationState,
  SignQualificationBody,
  WithdrawQualificationBody,
} from '../../shared/schemas/qualifications.js';
import { PERMISSIONS } from '../../shared/permissions.js';
import { recordAudit, type Ctx } from '../audit.js';
import { AppError, conflict, invalid, notFound } from '../errors.js';
import { Qualification, Stage, User } from '../models/index.js';
import { plantToday } from './plant.js';
import { signWithPassword } from './signatures.js';

/** A qualification counts as expiring this many days before its expiry day. */
export const WARN_DAYS = 30;

/** Roles that record station results, so need a qualification for each stage they record. */
const RECORDING_ROLES: readonly string[] = PERMISSIONS['results.record'];

const addDays = (iso: string, days: number) => {
  const d = new Date(`${iso}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + days);
  return d.toISOString().slice(0, 10);
};

export function stateOn(
  q: { expiresOn: string; trainedOn: string; withdrawnAt: Date | string | null },
  today: string,
  warnDays = WARN_DAYS,
): QualificationState {
  if (q.withdrawnAt) return 'withdrawn';
  // the expiry day is the last day it covers
  if (q.expiresOn < today) return 'expired';
  return q.expiresOn <= addDays(today, warnDays) ? 'expiring' : 'current';
}

type Row = {
  id: number;
  user_id: number;
  person: string;
  stage_code: string;
  stage_name: string;
  trained_on: string;
  expires_on: string;
  withdrawn_at: Date | null;
  withdrawn_reason: string | null;
  printed_name: string;
  meaning: string;
  reason: string;
  signed_at: Date;
};

/** The newest qualification of each person and stage (the one in force), with its signature. */
const CURRENT_SQL = `
SELECT DISTINCT ON (q.user_id, q.stage_id)
       q.id, q.user_id, u.name AS person, s.code AS stage_code, s.name AS stage_name,
       to_char(q.trained_on, 'YYYY-MM-DD') AS trained_on, to_char(q.expires_on, 'YYYY-MM-DD') AS expires_on,
       q.withdrawn_at, q.withdrawn_reason, g.printed_name, g.meaning, g.reason, g.signed_at
  FROM qualifications q
  JOIN users u ON u.id = q.user_id
  JOIN stages s ON s.id = q.stage_id
  JOIN signatures g ON g.id = q.signature_id
 WHERE u.active`;

const present = (r: Row, today: string): QualificationJson => ({
  id: r.id,
  person: { id: r.user_id, name: r.person },
  stage: { code: r.stage_code, name: r.stage_name },
  trainedOn: r.trained_on,
  expiresOn: r.expires_on,
  state: stateOn({ expiresOn: r.expires_on, trainedOn: r.trained_on, withdrawnAt: r.withdrawn_at }, today),
  signature: {
    printedName: r.printed_name,
    meaning: r.meaning,
    reason: r.reason,
    signedAt: new Date(r.signed_at).toISOString(),
  },
  withdrawn: r.withdrawn_at ? { at: new Date(r.withdrawn_at).toISOString(), reason: r.withdrawn_reason ?? '' } : null,
});

/** People who record results × the stages, each cell the qualification in force (or none). */
export async function qualificationMatrix(sequelize: Sequelize): Promise<QualificationMatrixJson> {
  const today = await plantToday();
  const [stages, people, rows] = await Promise.all([
    Stage.findAll({ order: [['id', 'ASC']] }),
    User.findAll({
      where: { active: true, role: [...RECORDING_ROLES] },
      order: [
        ['name', 'ASC'],
        ['id', 'ASC'],
      ],
    }),
    sequelize.query<Row>(`${CURRENT_SQL} ORDER BY q.user_id, q.stage_id, q.id DESC`, { type: QueryTypes.SELECT }),
  ]);
  const cells = new Map<number, Record<string, QualificationJson>>();
  for (const r of rows)
    (cells.get(r.user_id) ?? cells.set(r.user_id, {}).get(r.user_id)!)[r.stage_code] = present(r, today);
  return {
    today,
    warnDays: WARN_DAYS,
    stages: stages.map((s) => ({ code: s.code, name: s.name })),
    people: people.map((p) => ({ id: p.id, name: p.name, role: p.role, cells: cells.get(p.id) ?? {} })),
  };
}

/** Qualifications in force that expire within `days`, or expired in the last `days`: soonest first. */
export async function expiringQualifications(sequelize: Sequelize, days: number): Promise<QualificationJson[]> {
  const today = await plantToday();
  const rows = await sequelize.query<Row>(
    `SELECT * FROM (${CURRENT_SQL} ORDER BY q.user_id, q.stage_id, q.id DESC) c
      WHERE c.withdrawn_at IS NULL AND c.expires_on::date BETWEEN :from AND :to
      ORDER BY c.expires_on, c.person, c.stage_code LIMIT 200`,
    { type: QueryTypes.SELECT, replacements: { from: addDays(today, -days), to: addDays(today, days) } },
  );
  return rows.map((r) => present(r, today));
}

/** Signs a person off to record a stage, with the signer's password; a renewal is a new row. */
export async function signQualification(
  sequelize: Sequelize,
  ctx: Ctx,
  body: SignQualificationBody,
): Promise<QualificationJson> {
  return sequelize.transaction(async (transaction) => {
    const person = await User.findByPk(body.userId, { transaction });
    if (!person || !person.active) throw invalid('Choose an active person.', { userId: 'No such active person.' });
    if (!RECORDING_ROLES.includes(person.role)) {
      throw invalid(`${person.name} does not record station results, so needs no qualification.`, {
        userId: 'Not someone who records results.',
      });
    }
    if (person.id === ctx.actor!.id) {
      throw invalid('Someone else must sign off your own qualification.', { userId: 'You cannot sign yourself off.' });
    }
    const stage = await Stage.findOne({ where: { code: body.stage }, transaction });
    if (!stage) throw invalid('Choose a stage from the list.', { stage: `No stage ${body.stage}.` });
    const today = await plantToday(transaction);
    if (body.trainedOn > today) {
      throw invalid('The training day cannot be in the future.', { trainedOn: `Use ${today} or earlier.` });
    }
    if (body.expiresOn < today) {
      throw invalid('That qualification would already have expired.', { expiresOn: `Use ${today} or later.` });
    }
    // a lock on the person's row: two sign-offs for one person take turns, so "newest" is well defined
    await User.findByPk(person.id, { transaction, lock: transaction.LOCK.UPDATE });
    const { user: signer, signature } = await signWithPassword(ctx, transaction, {
      entity: 'qualification',
      entityId: `${person.id}:${stage.code}`,
      meaning: `Qualified to record ${stage.name} until ${body.expiresOn}`.slice(0, 120),
      reason: body.reason,
      password: body.password,
      refused: 'the qualification was not signed off.',
    });
    const q = await Qualification.create(
      {
        userId: person.id,
        stageId: stage.id,
        trainedOn: body.trainedOn,
        expiresOn: body.expiresOn,
        signedById: signer.id,
        signatureId: signature.id,
      },
      { transaction },
    );
    await recordAudit(ctx, transaction, {
      action: 'qualification.signed',
      entity: 'qualification',
      entityId: q.id,
      after: {
        person: person.id,
        stage: stage.code,
        trainedOn: body.trainedOn,
        expiresOn: body.expiresOn,
        signature: signature.id,
        meaning: signature.meaning,
        reason: body.reason,
      },
    });
    return qualificationById(sequelize, q.id, transaction);
  });
}

async function qualificationById(sequelize: Sequelize, id: number, transaction?: Transaction) {
  const [row] = await sequelize.query<Row>(
    `SELECT q.id, q.user_id, u.name AS person, s.code AS stage_code, s.name AS stage_name,
            to_char(q.trained_on, 'YYYY-MM-DD') AS trained_on, to_char(q.expires_on, 'YYYY-MM-DD') AS expires_on,
            q.withdrawn_at, q.withdrawn_reason, g.printed_name, g.meaning, g.reason, g.signed_at
       FROM qualifications q JOIN users u ON u.id = q.user_id JOIN stages s ON s.id = q.stage_id
       JOIN signatures g ON g.id = q.signature_id WHERE q.id = :id`,
    { type: QueryTypes.SELECT, replacements: { id }, transaction },
  );
  if (!row) throw notFound('That qualification');
  return present(row, await plantToday(transaction));
}

/** Withdraws a qualification before its expiry, signed, with a reason; the row stays. */
export async function withdrawQualification(
  sequelize: Sequelize,
  ctx: Ctx,
  id: number,
  body: WithdrawQualificationBody,
): Promise<QualificationJson> {
  return sequelize.transaction(async (transaction) => {
    const q = await Qualification.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!q) throw notFound('That qualification');
    if (q.withdrawnAt) throw conflict('That qualification was already withdrawn.');
    const stage = (await Stage.findByPk(q.stageId, { transaction }))!;
    const { signature } = await signWithPassword(ctx, transaction, {
      entity: 'qualification',
      entityId: String(q.id),
      meaning: `Withdrew the qualification to record ${stage.name}`.slice(0, 120),
      reason: body.reason,
      password: body.password,
      refused: 'the qualification was not withdrawn.',
    });
    await q.update(
      { withdrawnAt: signature.signedAt, withdrawnById: ctx.actor!.id, withdrawnReason: body.reason },
      { transaction },
    );
    await recordAudit(ctx, transaction, {
      action: 'qualification.withdrawn',
      entity: 'qualification',
      entityId: q.id,
      before: { expiresOn: q.expiresOn, withdrawn: false },
      after: { withdrawn: true, signature: signature.id, reason: body.reason },
    });
    return qualificationById(sequelize, q.id, transaction);
  });
}

/**
 * Refuses a result from someone not qualified for the stage today: no sign-off, withdrawn, or
 * expired. One statement (the newest row and the plant's time zone), inside the result's transaction.
 */
export async function requireQualified(
  sequelize: Sequelize,
  transaction: Transaction,
  who: { id: number; name?: string | null },
  stage: { id: number; name: string },
) {
  const [row] = await sequelize.query<{
    expires_on: string | null;
    withdrawn: boolean | null;
    tz: string | null;
    name: string;
  }>(
    `SELECT to_char(q.expires_on, 'YYYY-MM-DD') AS expires_on, q.withdrawn_at IS NOT NULL AS withdrawn,
            (SELECT time_zone FROM plant_settings WHERE id = 1) AS tz, u.name
       FROM users u
       LEFT JOIN LATERAL (SELECT expires_on, withdrawn_at FROM qualifications
                           WHERE user_id = u.id AND stage_id = :stageId ORDER BY id DESC LIMIT 1) q ON true
      WHERE u.id = :userId`,
    { type: QueryTypes.SELECT, replacements: { userId: who.id, stageId: stage.id }, transaction },
  );
  const name = row?.name ?? who.name ?? 'This person';
  const refuse = (message: string) => new AppError('not_qualified', `${message} Nothing was recorded.`);
  if (!row?.expires_on) {
    throw refuse(
      `${name} is not qualified to record ${stage.name}: no sign-off is on file. A supervisor can sign one off.`,
    );
  }
  if (row.withdrawn) {
    throw refuse(`${name}'s qualification to record ${stage.name} was withdrawn. A supervisor can sign a new one off.`);
  }
  const today = todayIn(row.tz ?? 'UTC');
  if (row.expires_on < today) {
    throw refuse(
      `${name}'s qualification to record ${stage.name} expired on ${row.expires_on}. A supervisor can renew it after refresher training.`,
    );
  }
}
