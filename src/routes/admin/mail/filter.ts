import { OUTBOX_STATUSES } from '../../../../shared/schemas/mail';
import type { OutboxFilter } from '../../../api/mail/outbox';
import { defined, oneOf, pageFrom } from '../../../lib/list-filter';

export const OUTBOX_PAGE_SIZE = 25;

/** The filters "Clear filters" empties. */
export const OUTBOX_FILTERS = ['status'] as const;

export function outboxFilterFrom(params: URLSearchParams): OutboxFilter {
  return defined({
    page: pageFrom(params),
    pageSize: OUTBOX_PAGE_SIZE,
    status: oneOf(OUTBOX_STATUSES, params.get('status')),
  });
}
