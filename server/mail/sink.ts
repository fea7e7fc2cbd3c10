import fs from 'node:fs';
import path from 'node:path';
import type { AddressInfo } from 'node:net';
import { simpleParser } from 'mailparser';
import { SMTPServer } from 'smtp-server';
import type { SinkMessage } from '../../shared/schemas/mail.js';

/**
 * A stand-in for the plant's mail server: an SMTP server on loopback that accepts every message
 * and files it as JSON in a folder. `npm start` runs it; the admin mail page and the tests read what
 * it received. It is not a relay: nothing leaves the machine.
 */
export type { SinkMessage };

export async function startMailSink({ port, dir, host = '127.0.0.1' }: { port: number; dir: string; host?: string }) {
  fs.mkdirSync(dir, { recursive: true });
  let n = 0;
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['AUTH', 'STARTTLS'],
    banner: 'Coretrail loopback mail sink',
    size: 5 * 1024 * 1024,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then((mail) => {
          const headers: Record<string, string> = {};
          for (const [k, v] of mail.headers) headers[k] = typeof v === 'string' ? v : JSON.stringify(v);
          const msg: Omit<SinkMessage, 'file'> = {
            receivedAt: new Date().toISOString(),
            messageId: mail.messageId ?? null,
            from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
            to: session.envelope.rcptTo.map((r) => r.address),
            subject: mail.subject ?? '',
            text: mail.text ?? '',
            headers,
          };
          const file = `${Date.now()}-${process.pid}-${++n}.json`;
          fs.writeFileSync(path.join(dir, file), JSON.stringify(msg, null, 2));
          callback();
        })
        .catch((err: Error) => callback(err));
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, host, () => resolve());
  });
  const address = server.server.address() as AddressInfo;
  return {
    port: address.port,
    dir,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}

/** What the sink has received, newest first. */
export function readMailSink(dir: string, limit = 200): SinkMessage[] {
  if (!fs.existsSync(dir)) return [];
  return fs
    .readdirSync(dir)
    .filter((f) => f.endsWith('.json'))
    .sort((a, b) => Number(b.split('-')[0]) - Number(a.split('-')[0]) || b.localeCompare(a))
    .slice(0, limit)
    .map((file) => ({
      file,
      ...(JSON.parse(fs.readFileSync(path.join(dir, file), 'utf8')) as Omit<SinkMessage, 'file'>),
    }));
}
