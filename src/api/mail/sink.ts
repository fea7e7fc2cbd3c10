import { queryOptions, useQuery } from '@tanstack/react-query';
import { http } from '../../lib/http';
import { mailKeys } from './keys';

import type { SinkMessage } from '../../../shared/schemas/mail';

export type { SinkMessage };

export const fetchMailSink = (signal?: AbortSignal) => http<SinkMessage[]>('/api/mail/sink', { signal });

export const mailSinkQueryOptions = () =>
  queryOptions({ queryKey: mailKeys.sink, queryFn: ({ signal }) => fetchMailSink(signal) });

export const useMailSink = () => useQuery(mailSinkQueryOptions());
