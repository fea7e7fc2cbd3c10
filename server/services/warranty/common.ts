import { differenceInCalendarDays, parseISO } from 'date-fns';
import { dateIn } from '../../../shared/domain/warranty.js';
import type { ClaimNext, ClaimState } from '../../../shared/schemas/warranty.js';
import { appLink } from '../../mail/links.js';
import type { Shipment } from '../../models/index.js';

export const claimLink = (number: string) => appLink(`/warranty/claims/${number}`);

/** The day a shipment left, in the plant's calendar (older rows kept only the instant). */
export const shipDateOf = (s: Shipment, timeZone: string) => s.shipDate ?? dateIn(timeZone, s.shippedAt);

/** Whole calendar days from one `YYYY-MM-DD` to another. */
export const daysBetween = (from: string, to: string) => differenceInCalendarDays(parseISO(to), parseISO(from));

/** The step a claim waits for: the unit taken back, torn down, the decision, the closure. */
export function nextStep(state: ClaimState, returned: boolean): ClaimNext {
  if (state === 'received') return returned ? 'teardown' : 'return';
  if (state === 'torn_down') return 'decide';
  if (state === 'decided') return 'close';
  return null;
}
