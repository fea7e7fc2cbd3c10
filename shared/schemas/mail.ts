/** One message the loopback mail sink received (server/mail/sink.ts), as GET /api/mail/sink returns it. */
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
