import { useOutboxMessage } from '../../../api/mail/outbox-message';
import { Dialog } from '../../../components/ui/dialog';
import { formatWhen } from '../../../lib/format';

/** A message as it was sent: its headers that matter, then the plain-text body exactly as written. */
export function MessageDialog({ id, onClose }: { id: number | null; onClose: () => void }) {
  const message = useOutboxMessage(id);
  const m = message.data;
  return (
    <Dialog open={id !== null} onClose={onClose} width="wide" title={m?.subject ?? 'Message'}>
      {!m ? (
        <p className="text-ink-soft">Loading the message…</p>
      ) : (
        <div className="flex flex-col gap-3">
          <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
            <dt className="font-semibold text-ink-soft">To</dt>
            <dd className="font-mono">{m.to}</dd>
            <dt className="font-semibold text-ink-soft">Queued</dt>
            <dd className="font-mono">{formatWhen(m.createdAt)}</dd>
            <dt className="font-semibold text-ink-soft">Sent</dt>
            <dd className="font-mono">{m.sentAt ? formatWhen(m.sentAt) : 'not yet'}</dd>
            <dt className="font-semibold text-ink-soft">Message-ID</dt>
            <dd className="break-all font-mono">{m.messageId ?? '—'}</dd>
          </dl>
          <pre className="max-h-[60vh] overflow-auto whitespace-pre-wrap rounded-control border border-rule bg-sunk p-3 font-mono text-[0.875rem]">
            {m.text}
          </pre>
        </div>
      )}
    </Dialog>
  );
}
