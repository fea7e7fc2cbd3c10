import { useAuditVerify } from '../../../api/audit/audit-verify';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { formatGrouped, formatWhen, plural } from '../../../lib/format';

/** Walks the hash chain on request and says plainly whether every event still links to the one before. */
export function AuditVerify() {
  const verify = useAuditVerify();
  const report = verify.data;
  const checkedAt = verify.dataUpdatedAt ? new Date(verify.dataUpdatedAt).toISOString() : null;

  return (
    <div>
      <div className="flex flex-wrap items-center gap-3">
        <Button
          icon="chain"
          onClick={() => void verify.refetch()}
          disabled={verify.isFetching}
          aria-busy={verify.isFetching}
        >
          Check the chain
        </Button>
        <span className="text-sm text-ink-soft">
          {verify.isFetching
            ? 'Checking every event…'
            : 'Each event carries a fingerprint of the one before it; an edit or a deletion breaks the chain.'}
        </span>
      </div>
      <div aria-live="polite" className="[&>*]:mt-3">
        {!verify.isFetching && verify.error && (
          <Notice tone="bad" title="The check could not run">
            {verify.error.message}
          </Notice>
        )}
        {!verify.isFetching && report?.ok && (
          <Notice tone="ok" title="Chain intact">
            All {plural(report.checked, 'event')} checked; each one links to the one before it. Checked{' '}
            {formatWhen(checkedAt)}.
          </Notice>
        )}
        {!verify.isFetching && report && !report.ok && (
          <Notice tone="bad" title="Chain broken">
            {report.firstBroken ? (
              <>
                The first broken link is at event{' '}
                <span className="font-mono font-semibold">#{report.firstBroken.id}</span>: {report.firstBroken.reason}.{' '}
                {formatGrouped(report.checked)} events were checked. Keep the database as it is and tell whoever looks
                after the server.
              </>
            ) : (
              <>The chain does not hold, but no event was named. {formatGrouped(report.checked)} events were checked.</>
            )}
          </Notice>
        )}
      </div>
    </div>
  );
}
