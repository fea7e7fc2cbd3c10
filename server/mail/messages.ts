import type { Transaction } from 'sequelize';
import { MailOutbox } from '../models/index.js';

/**
 * Messages are plain text. Anything a person typed is placed in the body only, never in a header;
 * the subject is built from serials and numbers Coretrail made, and line breaks are stripped from
 * it anyway, so no text can add a header.
 */
export const oneLine = (s: string, max = 200) =>
  s
    .replace(/[\r\n\u0085\u2028\u2029]+/g, ' ')
    .replace(/\p{Cc}/gu, '')
    .trim()
    .slice(0, max);

/** Typed text quoted into a message body: control characters removed, each line indented. */
export const quoted = (s: string) =>
  s
    .replace(/[^\P{Cc}\t\n\r]/gu, '')
    .split(/\r?\n/)
    .map((l) => `    ${l}`)
    .join('\n');

export type Mail = { to: string; subject: string; text: string; reason: string };

/**
 * Queues messages in the caller's transaction: they exist exactly when the change that caused them
 * commits, and the worker delivers them afterwards.
 */
export async function enqueueMail(transaction: Transaction, mails: Mail[]) {
  const unique = new Map(mails.map((m) => [`${m.to.toLowerCase()}|${m.subject}`, m]));
  for (const m of unique.values()) {
    const row = await MailOutbox.create(
      {
        toAddress: m.to,
        subject: oneLine(m.subject),
        bodyText: m.text,
        bodyHtml: null,
        claimedBy: null,
        claimedUntil: null,
        lastError: null,
        sentAt: null,
        messageId: null,
        reason: m.reason,
      },
      { transaction },
    );
    await row.update({ messageId: `<outbox-${row.id}@coretrail.local>` }, { transaction });
  }
}
