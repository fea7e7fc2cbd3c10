import { QueryTypes, type Sequelize } from 'sequelize';
import { enqueueMail, quoted } from '../../mail/messages.js';
import { plantToday } from '../plant.js';
import { caLink } from './records.js';

// an arbitrary constant naming "overdue reminders" among this database's advisory locks
const REMINDER_LOCK = 72_410_020;

/**
 * One message per overdue action per plant day. Several API processes may run this at once: each
 * pass runs in one transaction behind a transaction-level advisory lock (a second process skips
 * the pass instead of waiting), and the reminder's key (action, day) lets only one insert through
 * whatever happens, so a day's message is queued once, in the same transaction as its record.
 */
export async function sendOverdueReminders(sequelize: Sequelize, { today }: { today?: string } = {}): Promise<number> {
  return sequelize.transaction(async (transaction) => {
    const [lock] = await sequelize.query<{ ok: boolean }>('SELECT pg_try_advisory_xact_lock(:k) AS ok', {
      type: QueryTypes.SELECT,
      replacements: { k: REMINDER_LOCK },
      transaction,
    });
    if (!lock?.ok) return 0;
    const day = today ?? (await plantToday(transaction));
    const due = await sequelize.query<{
      number: string;
      title: string;
      description: string;
      due_on: string;
      email: string;
      name: string;
      active: boolean;
    }>(
      `WITH fresh AS (
         INSERT INTO corrective_action_reminders (task_id, reminded_on)
         SELECT t.id, CAST(:day AS date) FROM corrective_action_tasks t
           JOIN corrective_actions ca ON ca.id = t.corrective_action_id
          WHERE t.done_at IS NULL AND t.due_on < CAST(:day AS date) AND ca.state = 'open'
         ON CONFLICT DO NOTHING
         RETURNING task_id)
       SELECT ca.number, ca.title, t.description, to_char(t.due_on, 'YYYY-MM-DD') AS due_on, u.email, u.name, u.active
         FROM fresh JOIN corrective_action_tasks t ON t.id = fresh.task_id
         JOIN corrective_actions ca ON ca.id = t.corrective_action_id JOIN users u ON u.id = t.owner_id
        ORDER BY t.id`,
      { type: QueryTypes.SELECT, replacements: { day }, transaction },
    );
    await enqueueMail(
      transaction,
      due
        .filter((d) => d.active)
        .map((d) => ({
          to: d.email,
          subject: `Overdue since ${d.due_on}: your action in ${d.number}`,
          text: [
            `${d.name}, an action you own in corrective action ${d.number}, "${d.title}", was due on ${d.due_on} and is still open:`,
            quoted(d.description),
            '',
            `Mark it done when it is, or ask quality for a new date: ${caLink(d.number)}`,
            '',
            '— Coretrail',
          ].join('\n'),
          reason: 'corrective_action.overdue',
        })),
    );
    return due.length;
  });
}

/** The reminders on a timer in the API process, in the mail worker's manner; one pass at start. */
export class OverdueReminderJob {
  private timer: NodeJS.Timeout | null = null;
  private running = false;
  private pass: Promise<void> | null = null;

  constructor(
    private readonly sequelize: Sequelize,
    private readonly everyMs = 10 * 60_000,
  ) {}

  start() {
    if (this.running) return;
    this.running = true;
    const loop = () => {
      if (!this.running) return;
      this.pass = sendOverdueReminders(this.sequelize)
        .then(() => undefined)
        .catch((err) => console.error('[reminders]', (err as Error).message))
        .finally(() => {
          this.pass = null;
          if (this.running) this.timer = setTimeout(loop, this.everyMs);
        });
    };
    loop();
  }

  async stop() {
    this.running = false;
    if (this.timer) clearTimeout(this.timer);
    await this.pass;
  }
}
