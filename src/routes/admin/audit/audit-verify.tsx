import { useAuditVerify } from '../../../api/audit/audit-verify';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { formatGrouped, formatWhen, plural } from '../../../lib/format';

/** Checks the whole trail on request and says plainly whether the log, its heads and the old chain hold. */
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
          Check the log
        </Button>
        <span className="text-sm text-ink-soft">
          {verify.isFetching
            ? 'Checking every event, the tree and every signed head…'
            : 'Each event is a leaf of a hash tree whose root the plant signs; an edit or a deletion no longer gives the signed root.'}
        </span>
      </div>
      <div aria-live="polite" className="[&>*]:mt-3">
        {!verify.isFetching && verify.error && (
          <Notice tone="bad" title="The check could not run">
            {verify.error.message}
          </Notice>
        )}
        {!verify.isFetching && report?.ok && (
          <Notice tone="ok" title="Log intact">
            All {plural(report.checked, 'event')} in the log match their leaves;{' '}
            {plural(report.heads.total, 'signed head')} checked ({formatGrouped(report.heads.checked)} roots
            recomputed).{' '}
            {report.log.pending > 0 && `${plural(report.log.pending, 'event')} still waiting for a place. `}
            {report.chain.checked > 0 &&
              `The ${plural(report.chain.checked, 'event')} from before the log still chain. `}
            Checked {formatWhen(checkedAt)}.
          </Notice>
        )}
        {!verify.isFetching && report && !report.ok && (
          <Notice tone="bad" title="The log does not hold">
            {report.firstBroken?.id != null ? (
              <>
                The first problem is at event <span className="font-mono font-semibold">#{report.firstBroken.id}</span>:{' '}
                {report.firstBroken.reason}.
              </>
            ) : (
              <>{report.firstBroken?.reason ?? 'No problem was named'}.</>
            )}{' '}
            Keep the database as it is and tell whoever looks after the server.
            {report.problems.length > 1 && (
              <ul className="mt-2 list-disc pl-5 font-mono text-xs">
                {report.problems.map((p) => (
                  <li key={p}>{p}</li>
                ))}
              </ul>
            )}
          </Notice>
        )}
      </div>
    </div>
  );
}
