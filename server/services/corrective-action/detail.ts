import { Op, QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import type { Paged } from '../../../shared/schemas/common.js';
import type {
  CaContainmentJson,
  CaJson,
  CaListQuery,
  CaSourceJson,
  CaSummaryJson,
  TaskJson,
} from '../../../shared/schemas/corrective-action.js';
import { notFound } from '../../errors.js';
import { CorrectiveAction, CorrectiveActionMember, CorrectiveActionTask, Signature, User } from '../../models/index.js';
import { attachmentsOf } from '../attachments.js';
import { plantToday } from '../plant.js';
import { presentSignature } from '../signatures.js';
import { namesOf } from '../warranty/people.js';
import { readsTogether } from '../../read/reads-together.js';

/**
 * A corrective action as its page reads it: the record, the NCRs and claims it answers, its team,
 * the holds and field actions that contain the problem, the evidence, the actions with their
 * owners and due dates, the signatures, and what still stands between it and closure.
 */

export function presentTask(
  t: CorrectiveActionTask,
  ca: { number: string; title: string },
  name: (id: number | null) => string | null,
  today: string,
): TaskJson {
  return {
    id: t.id,
    correctiveAction: { number: ca.number, title: ca.title },
    kind: t.kind,
    description: t.description,
    owner: { id: t.ownerId, name: name(t.ownerId) ?? '' },
    dueOn: t.dueOn,
    overdue: !t.doneAt && t.dueOn < today,
    doneAt: t.doneAt?.toISOString() ?? null,
    doneBy: name(t.doneById),
    doneNote: t.doneNote,
  };
}

/** What must be true before quality may sign the closure, in words; empty when it may. */
export function closeBlockers(ca: CorrectiveAction, tasks: CorrectiveActionTask[], today: string): string[] {
  const out: string[] = [];
  if (!ca.problem.trim()) out.push('State the problem.');
  if (!ca.rootCause.trim()) out.push('Record the root cause and its evidence.');
  if (!tasks.some((t) => t.kind === 'corrective')) out.push('Add at least one corrective action.');
  const open = tasks.filter((t) => !t.doneAt);
  if (open.length) out.push(`${open.length} action${open.length === 1 ? ' is' : 's are'} still open.`);
  if (!ca.verificationDueOn) out.push('Set the day effectiveness is to be checked.');
  else if (ca.verifiedEffective !== true) {
    out.push(
      ca.verificationDueOn > today
        ? `Check effectiveness on or after ${ca.verificationDueOn}.`
        : ca.verifiedEffective === false
          ? 'The last check found it not effective: act again, then check again.'
          : 'Record whether the actions proved effective.',
    );
  }
  return out;
}

async function sourcesOf(sequelize: Sequelize, caId: number, t?: Transaction): Promise<CaSourceJson[]> {
  const rows = await sequelize.query<{
    ncr: string | null;
    ncr_state: string | null;
    subject: string | null;
    description: string | null;
    claim: string | null;
    claim_state: string | null;
    unit: string | null;
    symptom: string | null;
  }>(
    `SELECT n.number AS ncr, n.state AS ncr_state, coalesce(i.serial, 'lot ' || pl.lot_code) AS subject, n.description,
            c.number AS claim, c.state AS claim_state, u.serial AS unit, c.symptom
       FROM corrective_action_sources s
       LEFT JOIN nonconformances n ON n.id = s.nonconformance_id
       LEFT JOIN items i ON i.id = n.item_id LEFT JOIN part_lots pl ON pl.id = n.part_lot_id
       LEFT JOIN warranty_claims c ON c.id = s.warranty_claim_id LEFT JOIN items u ON u.id = c.unit_item_id
      WHERE s.corrective_action_id = :caId ORDER BY s.id`,
    { type: QueryTypes.SELECT, replacements: { caId }, transaction: t },
  );
  return rows.map((r) =>
    r.ncr
      ? { kind: 'ncr', number: r.ncr, state: r.ncr_state!, subject: r.subject ?? '', description: r.description! }
      : { kind: 'claim', number: r.claim!, state: r.claim_state!, unit: r.unit!, symptom: r.symptom! },
  );
}

async function containmentOf(sequelize: Sequelize, caId: number, t?: Transaction): Promise<CaContainmentJson[]> {
  const rows = await sequelize.query<{
    ncr: string | null;
    ncr_state: string | null;
    held: string | null;
    fa: string | null;
    fa_state: string | null;
    fa_unit: string | null;
    note: string;
    added_by: string;
    created_at: Date;
  }>(
    `SELECT n.number AS ncr, n.state AS ncr_state, coalesce(i.serial || ' (' || i.status || ')', 'lot ' || pl.lot_code) AS held,
            fa.number AS fa, fa.state AS fa_state, fu.serial AS fa_unit, x.note, u.name AS added_by, x.created_at
       FROM corrective_action_containment x JOIN users u ON u.id = x.added_by_id
       LEFT JOIN nonconformances n ON n.id = x.nonconformance_id
       LEFT JOIN items i ON i.id = n.item_id LEFT JOIN part_lots pl ON pl.id = n.part_lot_id
       LEFT JOIN field_actions fa ON fa.id = x.field_action_id LEFT JOIN items fu ON fu.id = fa.unit_item_id
      WHERE x.corrective_action_id = :caId ORDER BY x.id`,
    { type: QueryTypes.SELECT, replacements: { caId }, transaction: t },
  );
  return rows.map((r) => ({
    kind: r.ncr ? 'hold' : 'field_action',
    number: (r.ncr ?? r.fa)!,
    state: (r.ncr_state ?? r.fa_state)!,
    subject: r.ncr ? (r.held ?? '') : `${r.fa_unit} in the field`,
    note: r.note,
    addedBy: r.added_by,
    addedAt: new Date(r.created_at).toISOString(),
  }));
}

export async function caDetail(sequelize: Sequelize, number: string, t?: Transaction): Promise<CaJson> {
  const ca = await CorrectiveAction.findOne({ where: { number }, transaction: t });
  if (!ca) throw notFound(`Corrective action ${number}`);
  const [tasks, members, sources, containment, evidence, signatures, today] = await readsTogether(t, [
    () =>
      CorrectiveActionTask.findAll({ where: { correctiveActionId: ca.id }, order: [['id', 'ASC']], transaction: t }),
    () =>
      CorrectiveActionMember.findAll({
        where: { correctiveActionId: ca.id, removedAt: null },
        order: [['id', 'ASC']],
        transaction: t,
      }),
    () => sourcesOf(sequelize, ca.id, t),
    () => containmentOf(sequelize, ca.id, t),
    () => attachmentsOf('corrective_action', ca.number),
    () =>
      Signature.findAll({
        where: { entity: 'corrective_action', entityId: number },
        order: [['id', 'ASC']],
        transaction: t,
      }),
    () => plantToday(t),
  ]);
  const people = await User.findAll({
    where: { id: { [Op.in]: [0, ...members.map((m) => m.userId)] } },
    attributes: ['id', 'name', 'role'],
    transaction: t,
  });
  const name = await namesOf(
    [ca.openedById, ca.closedById, ca.verifiedById, ...tasks.flatMap((x) => [x.ownerId, x.doneById])],
    t,
  );
  const person = new Map(people.map((p) => [p.id, p]));
  return {
    number: ca.number,
    title: ca.title,
    state: ca.state,
    openedAt: ca.createdAt.toISOString(),
    openedBy: name(ca.openedById) ?? '',
    tasks: {
      total: tasks.length,
      done: tasks.filter((x) => x.doneAt).length,
      overdue: tasks.filter((x) => !x.doneAt && x.dueOn < today).length,
    },
    sources: sources.map((s) => s.number),
    problem: ca.problem,
    containment: ca.containment,
    rootCause: ca.rootCause,
    verificationDueOn: ca.verificationDueOn,
    verification:
      ca.verifiedAt && ca.verifiedEffective !== null
        ? {
            effective: ca.verifiedEffective,
            note: ca.verificationNote ?? '',
            by: name(ca.verifiedById) ?? '',
            at: ca.verifiedAt.toISOString(),
          }
        : null,
    closedBy: name(ca.closedById),
    closedAt: ca.closedAt?.toISOString() ?? null,
    sourceList: sources,
    team: members.map((m) => ({
      userId: m.userId,
      name: person.get(m.userId)?.name ?? '',
      role: person.get(m.userId)?.role ?? '',
      teamRole: m.teamRole,
    })),
    containmentLinks: containment,
    evidence,
    actions: tasks.map((x) => presentTask(x, ca, name, today)),
    signatures: signatures.map(presentSignature),
    closeBlockers: ca.state === 'open' ? closeBlockers(ca, tasks, today) : [],
  };
}

export async function listCas(sequelize: Sequelize, q: CaListQuery): Promise<Paged<CaSummaryJson>> {
  const today = await plantToday();
  const filter = q.state ? 'WHERE ca.state = :state' : '';
  const [rows, [count]] = await Promise.all([
    sequelize.query<{
      number: string;
      title: string;
      state: 'open' | 'closed';
      created_at: Date;
      opened_by: string;
      total: number;
      done: number;
      overdue: number;
      sources: string[];
    }>(
      `SELECT ca.number, ca.title, ca.state, ca.created_at, u.name AS opened_by,
              (SELECT count(*) FROM corrective_action_tasks t WHERE t.corrective_action_id = ca.id)::int AS total,
              (SELECT count(*) FROM corrective_action_tasks t WHERE t.corrective_action_id = ca.id AND t.done_at IS NOT NULL)::int AS done,
              (SELECT count(*) FROM corrective_action_tasks t WHERE t.corrective_action_id = ca.id AND t.done_at IS NULL
                  AND t.due_on < CAST(:today AS date))::int AS overdue,
              ARRAY(SELECT coalesce(n.number, c.number) FROM corrective_action_sources s
                      LEFT JOIN nonconformances n ON n.id = s.nonconformance_id
                      LEFT JOIN warranty_claims c ON c.id = s.warranty_claim_id
                     WHERE s.corrective_action_id = ca.id ORDER BY s.id) AS sources
         FROM corrective_actions ca JOIN users u ON u.id = ca.opened_by_id ${filter}
        ORDER BY ca.created_at DESC, ca.id DESC LIMIT :limit OFFSET :offset`,
      {
        type: QueryTypes.SELECT,
        replacements: { state: q.state, today, limit: q.pageSize, offset: (q.page - 1) * q.pageSize },
      },
    ),
    sequelize.query<{ n: number }>(`SELECT count(*)::int AS n FROM corrective_actions ca ${filter}`, {
      type: QueryTypes.SELECT,
      replacements: { state: q.state },
    }),
  ]);
  return {
    rows: rows.map((r) => ({
      number: r.number,
      title: r.title,
      state: r.state,
      openedAt: new Date(r.created_at).toISOString(),
      openedBy: r.opened_by,
      tasks: { total: r.total, done: r.done, overdue: r.overdue },
      sources: r.sources,
    })),
    total: count?.n ?? 0,
    page: q.page,
    pageSize: q.pageSize,
  };
}
