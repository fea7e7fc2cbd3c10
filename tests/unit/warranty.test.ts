import { addMonths } from 'date-fns';
import { describe, expect, it } from 'vitest';
import { dateIn, warrantyCover, warrantyEndsOn } from '../../shared/domain/warranty.js';

// Each expected date was worked out by hand on a printed Gregorian calendar (2026–2029): a term of
// N months ends on the same day N months on, or on the last day of a shorter month.
describe('warranty terms in calendar months', () => {
  it('when a term starts on a month end, then it ends on the last day of a shorter month', () => {
    expect(warrantyEndsOn('2026-08-31', 6)).toBe('2027-02-28'); // February 2027 has 28 days
    expect(warrantyEndsOn('2026-03-31', 1)).toBe('2026-04-30');
    expect(warrantyEndsOn('2027-08-31', 6)).toBe('2028-02-29'); // 2028 is a leap year
  });

  it('when a term starts on a leap day, then twelve months on it ends on 28 February', () => {
    expect(warrantyEndsOn('2028-02-29', 12)).toBe('2029-02-28');
    expect(warrantyEndsOn('2028-02-29', 48)).toBe('2032-02-29'); // 2032 is a leap year again
  });

  it('agrees with date-fns addMonths, the library it is built on, across every start day of 2026–2028', () => {
    for (
      let d = new Date(2026, 0, 1);
      d.getFullYear() < 2029;
      d = new Date(d.getFullYear(), d.getMonth(), d.getDate() + 1)
    ) {
      const start = `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, '0')}-${String(d.getDate()).padStart(2, '0')}`;
      const end = addMonths(d, 18);
      expect(warrantyEndsOn(start, 18)).toBe(
        `${end.getFullYear()}-${String(end.getMonth() + 1).padStart(2, '0')}-${String(end.getDate()).padStart(2, '0')}`,
      );
    }
  });

  it('when it is the end date, then the unit is still covered; the day after, it is not', () => {
    const terms = { startsOn: '2026-08-31', months: 6, km: null };
    expect(warrantyCover(terms, '2027-02-28')).toMatchObject({ covered: true, daysLeft: 0, endsOn: '2027-02-28' });
    expect(warrantyCover(terms, '2027-03-01')).toMatchObject({ covered: false, daysLeft: 0 });
    expect(warrantyCover(terms, '2027-03-01').reason).toBe('Not covered: the 6-month term ended on 2027-02-28.');
    expect(warrantyCover(terms, '2027-02-18').daysLeft).toBe(10);
  });

  it('when a claim gives a distance, then the kilometre limit counts too, whichever comes first', () => {
    const terms = { startsOn: '2026-01-15', months: 24, km: 100_000 };
    expect(warrantyCover(terms, '2026-06-01', { km: 100_000 }).covered).toBe(true); // on the limit is covered
    const past = warrantyCover(terms, '2026-06-01', { km: 100_001 });
    expect(past.covered).toBe(false);
    expect(past.reason).toBe('Not covered: 100,001 km is past the 100,000 km limit.');
    const both = warrantyCover(terms, '2028-02-01', { km: 150_000 });
    expect(both.reason).toMatch(/term ended on 2028-01-15; 150,000 km is past/);
    expect(warrantyCover(terms, '2026-06-01').reason).toBe(
      'Covered until 2028-01-15 and up to 100,000 km, whichever comes first.',
    );
  });

  it('when a date is before the ship date, then it is not covered', () => {
    expect(warrantyCover({ startsOn: '2026-05-10', months: 12, km: null }, '2026-05-09').covered).toBe(false);
  });
});

describe('the plant’s calendar day', () => {
  it('when it is 02:30 UTC, then it is still the day before in Chicago and already that day in Berlin', () => {
    // IANA tz database: America/Chicago is UTC−6 in December, Europe/Berlin UTC+1
    const instant = new Date('2026-12-03T02:30:00Z');
    expect(dateIn('America/Chicago', instant)).toBe('2026-12-02');
    expect(dateIn('Europe/Berlin', instant)).toBe('2026-12-03');
    expect(dateIn('UTC', instant)).toBe('2026-12-03');
  });
});
