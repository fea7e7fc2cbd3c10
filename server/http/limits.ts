import type { Config } from '../config.js';

/**
 * Counts failures (a wrong password, a wrong code) per key in a fixed window from the first one, and
 * refuses the key once it reaches the limit until the window ends. Checked before the attempt and
 * counted only after it has failed, so attempts that succeed, however many arrive at once, never
 * count (express-rate-limit counts every request first and takes successes back afterwards, so a
 * burst of right passwords tripped it). Kept in this process's memory: with several API processes,
 * see docs/operations.md.
 */
export class FailureLimiter {
  private readonly entries = new Map<string, { failures: number; resetAt: number }>();
  constructor(
    readonly limit: number,
    readonly windowMs: number,
  ) {}

  private live(key: string) {
    const e = this.entries.get(key);
    if (e && e.resetAt <= Date.now()) {
      this.entries.delete(key);
      return undefined;
    }
    return e;
  }

  /** Seconds until the key may try again, or 0 when it may now. */
  lockedFor(key: string): number {
    const e = this.live(key);
    return e && e.failures >= this.limit ? Math.ceil((e.resetAt - Date.now()) / 1000) : 0;
  }

  remaining(key: string): number {
    return Math.max(0, this.limit - (this.live(key)?.failures ?? 0));
  }

  fail(key: string): void {
    const e = this.live(key) ?? { failures: 0, resetAt: Date.now() + this.windowMs };
    e.failures += 1;
    this.entries.set(key, e);
  }

  clear(key: string): boolean {
    return this.entries.delete(key);
  }

  /** Every key refused right now. */
  locked(): { key: string; failures: number; until: Date }[] {
    const out: { key: string; failures: number; until: Date }[] = [];
    for (const key of [...this.entries.keys()]) {
      const e = this.live(key);
      if (e && e.failures >= this.limit) out.push({ key, failures: e.failures, until: new Date(e.resetAt) });
    }
    return out;
  }
}

/** The limits of one app: sign-in per account and per address, and re-entered passwords per person. */
export type Limits = {
  windowMin: number;
  signInAccount: FailureLimiter;
  signInAddress: FailureLimiter;
  /** Passwords typed again to sign a record or to change one's own password. */
  password: FailureLimiter;
};

export function makeLimits(config: Config): Limits {
  const windowMs = config.LOGIN_LIMIT_WINDOW_MIN * 60_000;
  return {
    windowMin: config.LOGIN_LIMIT_WINDOW_MIN,
    signInAccount: new FailureLimiter(config.LOGIN_LIMIT_PER_ACCOUNT, windowMs),
    signInAddress: new FailureLimiter(config.LOGIN_LIMIT_PER_ADDRESS, windowMs),
    password: new FailureLimiter(config.PASSWORD_LIMIT_PER_PERSON, windowMs),
  };
}

export const accountKey = (email: string) => email.trim().toLowerCase();
export const personKey = (userId: number) => `user:${userId}`;
