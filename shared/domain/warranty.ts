import { addMonths, differenceInCalendarDays, format, parseISO } from 'date-fns';

/**
 * Warranty cover, counted in calendar days of the plant's calendar. A term of N months ends on the
 * same day N months later, or on the last day of that month when it is shorter (31 August + 6
 * months ends on 28 February); the end date is covered. Where the family also limits distance,
 * the cover ends at whichever limit comes first.
 */

/** `YYYY-MM-DD` only: dates here are calendar days, never instants. */
export type CalendarDate = string;

const day = (d: CalendarDate) => parseISO(d); // local midnight of that day; only whole days are compared
const iso = (d: Date) => format(d, 'yyyy-MM-dd');

export function warrantyEndsOn(startsOn: CalendarDate, months: number): CalendarDate {
  return iso(addMonths(day(startsOn), months));
}

export type WarrantyTerms = { startsOn: CalendarDate; months: number; km: number | null };

export type Cover = {
  covered: boolean;
  endsOn: CalendarDate;
  /** Whole days of cover after `on`: 0 on the end date itself, which is still covered. */
  daysLeft: number;
  /** Why, in words: the date, the distance, or both. */
  reason: string;
};

/** Whether a unit is covered on a day and, when a claim gives one, at a distance. */
export function warrantyCover(terms: WarrantyTerms, on: CalendarDate, reading: { km?: number | null } = {}): Cover {
  const endsOn = warrantyEndsOn(terms.startsOn, terms.months);
  const left = differenceInCalendarDays(day(endsOn), day(on));
  const before = on < terms.startsOn;
  const pastDate = left < 0;
  const km = reading.km ?? null;
  const pastKm = terms.km !== null && km !== null && km > terms.km;
  const covered = !before && !pastDate && !pastKm;
  const reasons: string[] = [];
  if (before) reasons.push(`it had not shipped yet on ${on} (shipped ${terms.startsOn})`);
  if (pastDate) reasons.push(`the ${terms.months}-month term ended on ${endsOn}`);
  if (pastKm)
    reasons.push(`${km!.toLocaleString('en-US')} km is past the ${terms.km!.toLocaleString('en-US')} km limit`);
  let reason: string;
  if (covered) {
    const distance =
      terms.km === null
        ? ''
        : km === null
          ? ` and up to ${terms.km.toLocaleString('en-US')} km, whichever comes first`
          : `; ${km.toLocaleString('en-US')} km is within the ${terms.km.toLocaleString('en-US')} km limit`;
    reason = `Covered until ${endsOn}${distance}.`;
  } else {
    reason = `Not covered: ${reasons.join('; ')}.`;
  }
  return { covered, endsOn, daysLeft: covered ? left : 0, reason };
}

/** Today's date in a time zone (an IANA name such as `America/Chicago`), as the plant's calendar has it. */
export function todayIn(timeZone: string, now: Date = new Date()): CalendarDate {
  return dateIn(timeZone, now);
}

/** The calendar day an instant falls on in a time zone. */
export function dateIn(timeZone: string, instant: Date): CalendarDate {
  // en-CA formats as YYYY-MM-DD
  return new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(
    instant,
  );
}

/** Whether a string names a time zone this runtime knows. */
export function isTimeZone(name: string): boolean {
  try {
    new Intl.DateTimeFormat('en-US', { timeZone: name });
    return true;
  } catch {
    return false;
  }
}
