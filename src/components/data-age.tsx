import type { Freshness } from '../../shared/schemas/trail';

const time = (iso: string) =>
  new Date(iso).toLocaleTimeString([], { hour: '2-digit', minute: '2-digit', second: '2-digit' });

/**
 * Says how old a read-only page's data may be when it was read from the plant's standby copy of
 * the database (nothing when it came from the main one, which is always current).
 */
export function DataAge({ readFrom }: { readFrom: Freshness }) {
  if (readFrom.source === 'primary') return null;
  return (
    <p className="text-sm text-ink-soft" data-testid="data-age">
      {readFrom.lagSeconds > 0
        ? `Read from the standby copy of the database, about ${Math.ceil(readFrom.lagSeconds)} s behind: it shows what was recorded up to ${time(readFrom.asOf)}.`
        : `Read from the standby copy of the database, which was up to date at ${time(readFrom.asOf)}.`}
    </p>
  );
}
