import type { SubmitResultBody } from '../../../shared/schemas/results.js';
import { invalid } from '../../errors.js';

/** A tablet's clock may run a little ahead of the server's; beyond this, its time is refused. */
const CLOCK_AHEAD_MS = 5 * 60_000;
/** A result kept on a tablet longer than a week is refused: take the reading again. */
const QUEUED_AT_MOST_MS = 7 * 24 * 3_600_000;

/**
 * When the result was taken on the tablet: what it says, checked against the server's clock, or the
 * moment it arrived when it says nothing (an older tablet page).
 */
export function tabletTime(body: SubmitResultBody, now: Date): Date {
  if (!body.takenAt) return now;
  const taken = new Date(body.takenAt);
  if (taken.getTime() > now.getTime() + CLOCK_AHEAD_MS) {
    throw invalid("The tablet's clock is ahead of the server's. Set its time, then record again.", {
      takenAt: 'Later than the server’s time.',
    });
  }
  if (now.getTime() - taken.getTime() > QUEUED_AT_MOST_MS) {
    throw invalid('This result was kept on the tablet for more than a week. Nothing was recorded: take it again.', {
      takenAt: 'More than 7 days ago.',
    });
  }
  if (body.startedAt && taken.getTime() < new Date(body.startedAt).getTime()) {
    throw invalid('The result was taken before its form was opened: check the tablet’s clock.', {
      takenAt: 'Before the form was opened (startedAt).',
    });
  }
  return taken;
}
