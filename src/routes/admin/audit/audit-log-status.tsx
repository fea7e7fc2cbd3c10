import { useState } from 'react';
import { fetchAllHeads } from '../../../api/audit/log-heads';
import { useLogStatus } from '../../../api/audit/log-status';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { formatGrouped, formatWhen, plural } from '../../../lib/format';

function downloadJson(filename: string, body: unknown) {
  const url = URL.createObjectURL(new Blob([JSON.stringify(body, null, 2)], { type: 'application/json' }));
  const a = document.createElement('a');
  a.href = url;
  a.download = filename;
  document.body.append(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}

/** How far the log has taken in the trail, the latest signed head, and the export of every head. */
export function AuditLogStatus() {
  const status = useLogStatus();
  const [exporting, setExporting] = useState(false);
  const s = status.data;

  const onExport = async () => {
    setExporting(true);
    try {
      const heads = await fetchAllHeads();
      downloadJson(`coretrail-log-heads-${new Date().toISOString().slice(0, 10)}.json`, heads);
    } finally {
      setExporting(false);
    }
  };

  if (status.error) return <Notice tone="bad">{status.error.message}</Notice>;
  if (!s) return <p className="text-sm text-ink-soft">Reading the log…</p>;
  return (
    <div className="flex flex-col gap-3">
      <dl className="grid grid-cols-1 gap-x-6 gap-y-2 text-sm sm:grid-cols-3">
        <div>
          <dt className="text-ink-soft">In the log</dt>
          <dd className="font-mono text-base font-semibold">{formatGrouped(s.treeSize)}</dd>
          <dd className="text-ink-soft">
            {s.integratedAt ? `last placed ${formatWhen(s.integratedAt, { seconds: true })}` : 'nothing placed yet'}
          </dd>
        </div>
        <div>
          <dt className="text-ink-soft">Waiting for a place</dt>
          <dd className="font-mono text-base font-semibold">{formatGrouped(s.pending)}</dd>
          <dd className="text-ink-soft">
            {s.oldestPendingAt
              ? `oldest since ${formatWhen(s.oldestPendingAt, { seconds: true })}`
              : 'none: the log is up to date'}
          </dd>
        </div>
        <div>
          <dt className="text-ink-soft">Latest signed head</dt>
          {s.latestHead ? (
            <>
              <dd className="font-mono text-base font-semibold">{plural(s.latestHead.treeSize, 'entry', 'entries')}</dd>
              <dd className="text-ink-soft">
                signed {formatWhen(new Date(s.latestHead.timestamp).toISOString(), { seconds: true })}
              </dd>
            </>
          ) : (
            <dd className="text-ink-soft">none yet</dd>
          )}
        </div>
      </dl>
      {s.signing ? (
        <p className="break-all font-mono text-xs text-ink-faint">
          plant key {s.signing.keyId} · root {s.rootHash}
        </p>
      ) : (
        <Notice tone="hold" title="Heads are not being signed">
          This server has no signing key (AUDIT_SIGNING_KEY), so nobody outside can check documents against the log.
        </Notice>
      )}
      <div>
        <Button icon="download" onClick={onExport} disabled={exporting || !s.latestHead} aria-busy={exporting}>
          Export signed heads (JSON)
        </Button>
      </div>
    </div>
  );
}
