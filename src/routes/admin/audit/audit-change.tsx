import type { AuditEvent } from '../../../../shared/schemas/audit';

const isRecord = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);

/** Top-level fields whose value differs, so the eye goes to what changed before reading the JSON. */
function changedKeys(before: unknown, after: unknown): string[] {
  if (!isRecord(before) || !isRecord(after)) return [];
  const keys = new Set([...Object.keys(before), ...Object.keys(after)]);
  return [...keys].filter((k) => JSON.stringify(before[k]) !== JSON.stringify(after[k]));
}

function Json({ label, value }: { label: string; value: unknown }) {
  return (
    <figure className="min-w-0">
      <figcaption className="mb-1 text-xs font-semibold uppercase tracking-wide text-ink-soft">{label}</figcaption>
      {value === null || value === undefined ? (
        <p className="text-sm text-ink-soft">Nothing recorded.</p>
      ) : (
        <pre className="max-h-72 overflow-auto rounded-control border border-rule bg-field p-3 font-mono text-[0.8rem] leading-relaxed">
          {JSON.stringify(value, null, 2)}
        </pre>
      )}
    </figure>
  );
}

export function AuditChange({ event }: { event: AuditEvent }) {
  const changed = changedKeys(event.before, event.after);
  return (
    <div className="flex flex-col gap-3">
      {changed.length > 0 && (
        <p className="text-sm">
          <span className="text-ink-soft">Changed: </span>
          {changed.map((k, i) => (
            <span key={k}>
              {i > 0 && ', '}
              <code className="font-mono font-semibold">{k}</code>
            </span>
          ))}
        </p>
      )}
      <div className="grid grid-cols-1 gap-4 md:grid-cols-2">
        <Json label="Before" value={event.before} />
        <Json label="After" value={event.after} />
      </div>
      <p className="font-mono text-xs text-ink-faint">
        event #{event.id} · request {event.requestId ?? '—'} ·{' '}
        {event.leafIndex === null ? 'waiting for its place in the log' : `log entry ${event.leafIndex + 1}`}
      </p>
    </div>
  );
}
