import { useState } from 'react';
import type { SinkMessage } from '../../../api/mail/sink';
import { Button } from '../../../components/ui/button';
import { Icon } from '../../../components/ui/icon';
import { formatWhen, plural } from '../../../lib/format';

const SHOWN = 20;

/** What the loopback sink received, newest first; each body opens as plain text (React escapes it). */
export function SinkList({ messages }: { messages: SinkMessage[] }) {
  const [all, setAll] = useState(false);
  if (messages.length === 0) {
    return <p className="px-5 py-6 text-ink-soft">The sink has received nothing yet.</p>;
  }
  const shown = all ? messages : messages.slice(0, SHOWN);
  return (
    <>
      <ul className="divide-y divide-rule">
        {shown.map((m) => (
          <li key={m.file}>
            <details className="group">
              <summary className="grid cursor-pointer list-none grid-cols-[auto_minmax(0,1fr)] gap-x-3 px-5 py-3 hover:bg-sunk/60 md:grid-cols-[auto_minmax(0,1fr)_auto]">
                <Icon name="chevronRight" size={18} className="mt-0.5 transition-transform group-open:rotate-90" />
                <span className="min-w-0">
                  <span className="block font-medium">{m.subject || '(no subject)'}</span>
                  <span className="block text-sm text-ink-soft">To {m.to.join(', ') || '—'}</span>
                </span>
                <span className="col-start-2 font-mono text-sm text-ink-soft md:col-start-3">
                  <time dateTime={m.receivedAt}>{formatWhen(m.receivedAt, { seconds: true })}</time>
                </span>
              </summary>
              <div className="border-t border-rule bg-sunk px-5 py-3">
                <dl className="mb-2 grid grid-cols-[auto_minmax(0,1fr)] gap-x-4 text-sm">
                  <dt className="text-ink-soft">From</dt>
                  <dd className="font-mono">{m.from || '—'}</dd>
                  {m.messageId && (
                    <>
                      <dt className="text-ink-soft">Message id</dt>
                      <dd className="break-all font-mono">{m.messageId}</dd>
                    </>
                  )}
                </dl>
                <pre className="max-h-96 overflow-auto whitespace-pre-wrap break-words rounded-control border border-rule bg-field p-3 font-mono text-[0.875rem] leading-relaxed">
                  {m.text || '(no plain-text body)'}
                </pre>
              </div>
            </details>
          </li>
        ))}
      </ul>
      {messages.length > SHOWN && !all && (
        <div className="border-t border-rule px-5 py-3">
          <Button size="sm" onClick={() => setAll(true)}>
            Show all {plural(messages.length, 'message')}
          </Button>
        </div>
      )}
    </>
  );
}
