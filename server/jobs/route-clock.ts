import type { Sequelize } from 'sequelize';
import { settleCharacteristicVersions } from '../services/characteristic-versions.js';
import { settleRouteVersions } from '../services/process/index.js';

/**
 * Every minute, brings route and characteristic versions approved to take effect later into force
 * when their time comes, so the line reads and stations see them without anyone opening them.
 */
export class RouteClock {
  private timer: NodeJS.Timeout | null = null;
  private running: Promise<unknown> | null = null;
  constructor(
    private readonly sequelize: Sequelize,
    private readonly everyMs = 60_000,
  ) {}

  start() {
    const tick = () => {
      if (this.running) return;
      this.running = settleRouteVersions(this.sequelize)
        .then(async (n) => n + (await settleCharacteristicVersions(this.sequelize)))
        .then(
          (n) =>
            n && console.log(`[process] ${n} route or characteristic version${n > 1 ? 's' : ''} changed state on time`),
        )
        .catch((err: unknown) => console.error('[routes] bringing route versions into force failed:', err))
        .finally(() => (this.running = null));
    };
    tick();
    this.timer = setInterval(tick, this.everyMs);
    this.timer.unref();
  }

  async stop() {
    if (this.timer) clearInterval(this.timer);
    await this.running;
  }
}
