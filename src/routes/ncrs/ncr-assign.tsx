import { OPEN_NCR_STATES } from '../../../shared/schemas/ncr';
import { useAssignNcr } from '../../api/ncrs/assign-ncr';
import type { NcrDetail } from '../../api/ncrs/types';
import { Button } from '../../components/ui/button';

/** Who has the NCR, and for quality the one-click ways to take it or let it go. */
export function NcrAssignee({ ncr, me, canDecide }: { ncr: NcrDetail; me: { id: number }; canDecide: boolean }) {
  const assign = useAssignNcr(ncr.number);
  const open = OPEN_NCR_STATES.includes(ncr.state);
  const mine = ncr.assigneeId === me.id;
  return (
    <span className="inline-flex flex-wrap items-center gap-2">
      <span>
        Assigned to <span className="font-medium text-ink">{ncr.assignee ?? 'nobody'}</span>
      </span>
      {canDecide && open && (
        <>
          {!mine && (
            <Button size="sm" disabled={assign.isPending} onClick={() => assign.mutate({ assigneeId: me.id })}>
              Assign to me
            </Button>
          )}
          {ncr.assigneeId !== null && (
            <Button
              size="sm"
              variant="quiet"
              disabled={assign.isPending}
              onClick={() => assign.mutate({ assigneeId: null })}
            >
              Unassign
            </Button>
          )}
        </>
      )}
      {assign.error && (
        <span role="alert" className="text-sm font-medium text-bad">
          {assign.error.message}
        </span>
      )}
    </span>
  );
}
