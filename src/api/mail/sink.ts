import { queryOptions, useQuery } from '@tanstack/react-query';
import { http } from '../../lib/http';
import { mailKeys } from './keys';

/** One message the loopback mail sink received (server/mail/sink.ts), newest first. */
export type SinkMessage = {
  file: string;
  receivedAt: string;
  messageId: string | null;
  from: string;
  to: string[];
  subject: string;
  text: string;
  headers: Record<string, string>;
};

export const fetchMailSink = (signal?: AbortSignal) => http<SinkMessage[]>('/api/mail/sink', { signal });

export const mailSinkQueryOptions = () =>
  queryOptions({ queryKey: mailKeys.sink, queryFn: ({ signal }) => fetchMailSink(signal) });

export const useMailSink = () => useQuery(mailSinkQueryOptions());
