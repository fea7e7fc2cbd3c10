import { hostname } from 'node:os';
import { randomBytes } from 'node:crypto';
import nodemailer, { type Transporter } from 'nodemailer';
import PQueue from 'p-queue';
import { QueryTypes, type Sequelize } from 'sequelize';

type Row = {
  id: string;
  to_address: string;
  subject: string;
  body_text: string;
  message_id: string | null;
  attempts: number;
};

export type MailWorkerOptions = {
  smtp: { host: string; port: number };
  from: string;
  /** How long a claimed row stays this worker's before another may take it over (a crash). */
  leaseSeconds?: number;
  pollMs?: number;
  batch?: number;
  concurrency?: number;
  maxAttempts?: number;
  /** Seconds to wait before attempt n+1 (default 2^n, at most an hour). */
  backoff?: (attempts: number) => number;
  /**
   * Deliver only these outbox rows (ids), leaving the rest to the plant's own worker: sending chosen
   * messages again, or a drill that must count only the messages it made.
   */
  onlyIds?: string[];
};

/**
 * Delivers the outbox. Rows are claimed with FOR UPDATE SKIP LOCKED and a lease, so several API
 * processes can run workers side by side and no row is taken by two of them; a worker that dies
 * holding a lease loses it when the lease runs out. Each attempt is marked sent, retried later
 * with backoff, or failed after the last attempt.
 */
export class MailWorker {
  readonly id = `${hostname()}:${process.pid}:${randomBytes(3).toString('hex')}`;
  private readonly queue: PQueue;
  private readonly transport: Transporter;
  private timer: NodeJS.Timeout | null = null;
  private running = false;
  private ticking: Promise<void> | null = null;

  constructor(
    private readonly sequelize: Sequelize,
    private readonly opts: MailWorkerOptions,
  ) {
    this.queue = new PQueue({ concurrency: opts.concurrency ?? 2 });
    this.transport = nodemailer.createTransport({
      host: opts.smtp.host,
      port: opts.smtp.port,
      secure: false,
      // the loopback sink offers no TLS; a real relay would be configured with it
      ignoreTLS: opts.smtp.host === '127.0.0.1' || opts.smtp.host === 'localhost',
      connectionTimeout: 5000,
      greetingTimeout: 5000,
      socketTimeout: 10000,
    });
  }

  start() {
    if (this.running) return;
    this.running = true;
    const loop = () => {
      if (!this.running) return;
      this.ticking = this.tick()
        .then(() => undefined)
        .catch((err) => console.error('[mail] worker:', (err as Error).message))
        .finally(() => {
          this.ticking = null;
          if (this.running) this.timer = setTimeout(loop, this.opts.pollMs ?? 1000);
        });
    };
    loop();
  }

  /** Stops claiming; waits for the messages in hand to finish. */
  async stop() {
    this.running = false;
    if (this.timer) clearTimeout(this.timer);
    await this.ticking;
    await this.queue.onIdle();
    this.transport.close();
  }

  /** Claims one batch of due rows and delivers them; returns how many it claimed. */
  async tick(): Promise<number> {
    const rows = await this.claim();
    await Promise.all(rows.map((r) => this.queue.add(() => this.deliver(r))));
    return rows.length;
  }

  /**
   * Takes due rows (and rows whose lease ran out: a worker died holding them) for this worker. A
   * claim commits on its own, so a crash after it leaves rows that another worker takes over later.
   */
  async claim(): Promise<Row[]> {
    const lease = this.opts.leaseSeconds ?? 60;
    return this.sequelize.query<Row>(
      `UPDATE mail_outbox SET status = 'sending', claimed_by = :worker,
              claimed_until = now() + make_interval(secs => :lease), attempts = attempts + 1
        WHERE id IN (
          SELECT id FROM mail_outbox
           WHERE ((status = 'pending' AND next_attempt_at <= now())
                  OR (status = 'sending' AND claimed_until < now()))
             AND (CAST(:only AS bigint[]) IS NULL OR id = ANY(CAST(:only AS bigint[])))
           ORDER BY id
           LIMIT :batch
           FOR UPDATE SKIP LOCKED)
        RETURNING id, to_address, subject, body_text, message_id, attempts`,
      {
        type: QueryTypes.SELECT,
        replacements: {
          worker: this.id,
          lease,
          batch: this.opts.batch ?? 20,
          only: this.opts.onlyIds ? `{${this.opts.onlyIds.map((id) => String(BigInt(id))).join(',')}}` : null,
        },
      },
    );
  }

  /** Runs ticks until nothing is due (tests and shutdown use it). */
  async drain(maxRounds = 50) {
    for (let i = 0; i < maxRounds; i++) if ((await this.tick()) === 0) return;
  }

  private async deliver(r: Row) {
    try {
      await this.transport.sendMail({
        from: this.opts.from,
        to: r.to_address,
        subject: r.subject,
        text: r.body_text,
        messageId: r.message_id ?? undefined,
        disableFileAccess: true,
        disableUrlAccess: true,
      });
      await this.sequelize.query(
        `UPDATE mail_outbox SET status = 'sent', sent_at = now(), last_error = NULL, claimed_until = NULL
          WHERE id = :id AND claimed_by = :worker`,
        { replacements: { id: r.id, worker: this.id } },
      );
    } catch (err) {
      const failed = r.attempts >= (this.opts.maxAttempts ?? 8);
      const wait = (this.opts.backoff ?? ((n: number) => Math.min(3600, 2 ** n)))(r.attempts);
      await this.sequelize.query(
        `UPDATE mail_outbox SET status = :status, last_error = :error, claimed_until = NULL,
                next_attempt_at = now() + make_interval(secs => :wait)
          WHERE id = :id AND claimed_by = :worker`,
        {
          replacements: {
            id: r.id,
            worker: this.id,
            status: failed ? 'failed' : 'pending',
            error: String((err as Error).message).slice(0, 500),
            wait,
          },
        },
      );
    }
  }
}
