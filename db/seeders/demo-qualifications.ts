import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { recordAudit, type Ctx } from '../../server/audit.js';

const day = (today: string, days: number) =>
  new Date(Date.parse(`${today}T00:00:00Z`) + days * 86_400_000).toISOString().slice(0, 10);

/**
 * Everyone on the demo floor who records results is qualified for every stage, signed off by the
 * demo supervisor (the supervisor by the admin): trained 60 days ago, for a year. One of the
 * operator's stages runs out in 12 days, so the supervisor's home has something expiring.
 * `expiringStage` is the stage code that expires soon.
 */
export async function seedDemoQualifications(
  sequelize: Sequelize,
  transaction: Transaction,
  ctx: Ctx,
  today: string,
  expiringStage: string,
) {
  const ids = await sequelize.query<{ id: number; role: string; name: string }>(
    `SELECT id, role, name FROM users WHERE role IN ('operator', 'supervisor', 'admin') ORDER BY id`,
    { type: QueryTypes.SELECT, transaction },
  );
  const first = (role: string) => ids.find((u) => u.role === role)!;
  const pairs = [
    { person: first('operator'), signer: first('supervisor') },
    { person: first('supervisor'), signer: first('admin') },
  ];
  for (const { person, signer } of pairs) {
    await sequelize.query(
      `WITH sig AS (
         INSERT INTO signatures (user_id, printed_name, meaning, reason, entity, entity_id, signed_at)
         VALUES (:signer, :signerName, 'Qualified to record every stage of the demo line', 'Demo plant: initial training',
                 'qualification', :person, :signedAt)
         RETURNING id)
       INSERT INTO qualifications (user_id, stage_id, trained_on, expires_on, signed_by_id, signature_id)
       SELECT :person, s.id, :trainedOn,
              CASE WHEN s.code = :expiringStage AND :isOperator THEN :soon ELSE :expiresOn END::date,
              :signer, sig.id
         FROM stages s, sig ORDER BY s.id`,
      {
        transaction,
        replacements: {
          signer: signer.id,
          signerName: signer.name,
          person: person.id,
          signedAt: new Date(`${day(today, -60)}T09:00:00Z`),
          trainedOn: day(today, -60),
          expiresOn: day(today, 305),
          soon: day(today, 12),
          expiringStage,
          isOperator: person.role === 'operator',
        },
      },
    );
  }
  await recordAudit(ctx, transaction, {
    action: 'qualifications.seeded',
    entity: 'qualification',
    entityId: 'demo',
    after: { people: pairs.map((p) => p.person.id), expiringStage, expiresOn: day(today, 12) },
  });
}
