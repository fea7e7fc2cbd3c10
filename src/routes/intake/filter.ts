import { GRADES, INTAKE_SORTS, SOURCES } from '../../../shared/schemas/intake';
import type { IntakeLogFilter } from '../../api/cores/intake-log';
import { defined, dirFrom, exportHref, isoDay, oneOf, pageFrom, positiveInt } from '../../lib/list-filter';

export const INTAKE_PAGE_SIZE = 25;

/** The filters "Clear filters" empties. */
export const INTAKE_FILTERS = ['q', 'family', 'source', 'grade', 'accepted', 'from', 'to'] as const;

/** The log's filters, sort and page live in the address; anything malformed there is left out. */
export function intakeFilterFrom(params: URLSearchParams): IntakeLogFilter {
  return defined({
    page: pageFrom(params),
    pageSize: INTAKE_PAGE_SIZE,
    sort: oneOf(INTAKE_SORTS, params.get('sort')) ?? 'receivedOn',
    dir: dirFrom(params),
    family: positiveInt(params.get('family')),
    source: oneOf(SOURCES, params.get('source')),
    grade: oneOf(GRADES, params.get('grade')),
    accepted: oneOf(['true', 'false'] as const, params.get('accepted')),
    from: isoDay(params.get('from')),
    to: isoDay(params.get('to')),
    q: params.get('q')?.trim().slice(0, 40),
  });
}

/** The same rows as CSV: every filter and the sort, without the paging. */
export const intakeExportHref = (filter: IntakeLogFilter) => exportHref('/api/cores/export.csv', filter);
