import { QueryTypes, type Sequelize } from 'sequelize';
import { recordAudit, systemCtx } from '../audit.js';
import type { BlobStore } from '../storage/blob-store.js';

const BATCH = 200;

/**
 * Removes photos that were uploaded but never attached to a record within `olderThanHours`: their
 * rows (each with an audit event, in one transaction) and then their files. Safe with several API
 * processes running it at once: rows are claimed with FOR UPDATE SKIP LOCKED, so each goes to one
 * sweeper, and a record claiming a photo at that moment waits for the row and then finds it gone
 * ("upload it again"). A file whose removal fails after the commit is only an orphan on disk.
 */
export async function sweepUnclaimedUploads(
  sequelize: Sequelize,
  store: BlobStore,
  { olderThanHours = 24 }: { olderThanHours?: number } = {},
): Promise<number> {
  let total = 0;
  for (;;) {
    const removed = await sequelize.transaction(async (transaction) => {
      const rows = await sequelize.query<{
        id: number;
        storage_key: string;
        file_name: string;
        uploaded_by_id: number;
      }>(
        `DELETE FROM attachments WHERE id IN (
           SELECT id FROM attachments
            WHERE entity = 'pending' AND created_at < now() - make_interval(secs => :seconds)
            ORDER BY id LIMIT :batch FOR UPDATE SKIP LOCKED)
         RETURNING id, storage_key, file_name, uploaded_by_id`,
        { type: QueryTypes.SELECT, replacements: { seconds: olderThanHours * 3600, batch: BATCH }, transaction },
      );
      for (const r of rows) {
        await recordAudit(systemCtx(), transaction, {
          action: 'attachment.discarded_unclaimed',
          entity: 'attachment',
          entityId: r.id,
          before: { fileName: r.file_name, uploadedById: r.uploaded_by_id },
        });
      }
      return rows;
    });
    for (const r of removed) {
      await store.remove(r.storage_key).catch((err: unknown) => {
        console.error(`[uploads] could not remove ${r.storage_key}:`, err);
      });
    }
    total += removed.length;
    if (removed.length < BATCH) return total;
  }
}

/** Runs the sweep every hour in this process (and once shortly after start). */
export class UploadSweeper {
  private timers: NodeJS.Timeout[] = [];
  private running: Promise<unknown> | null = null;
  constructor(
    private readonly sequelize: Sequelize,
    private readonly store: BlobStore,
    private readonly olderThanHours: number,
    private readonly everyMs = 3600_000,
  ) {}

  start() {
    const tick = () => {
      this.running = sweepUnclaimedUploads(this.sequelize, this.store, { olderThanHours: this.olderThanHours })
        .then((n) => n && console.log(`[uploads] removed ${n} unclaimed photo(s)`))
        .catch((err: unknown) => console.error('[uploads] sweep failed:', err))
        .finally(() => (this.running = null));
    };
    this.timers = [setTimeout(tick, 60_000), setInterval(tick, this.everyMs)];
    for (const t of this.timers) t.unref();
  }

  async stop() {
    for (const t of this.timers) clearTimeout(t);
    await this.running;
  }
}
