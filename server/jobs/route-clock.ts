import type { Sequelize } from 'sequelize';
import { settleRouteVersions } from '../services/process-routes.js';

/**
 * Every minute, brings route versions approved to take effect later into force when their time
 * comes (settleRouteVersions), so the line reads see the new version without anyone opening it.
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
        .then((n) => n && console.log(`[routes] ${n} route version${n > 1 ? 's' : ''} changed state on time`))
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
