import type { Person } from '../../../../shared/schemas/people';
import { useResetSecondFactor } from '../../../api/people/reset-second-factor';
import { ConfirmDialog } from '../../../components/confirm-dialog';

/** A lost phone: clear the second factor; they sign in again and set a new one up. */
export function ResetSecondFactorDialog({ person, onClose }: { person: Person; onClose: () => void }) {
  const reset = useResetSecondFactor();
  return (
    <ConfirmDialog
      open
      title={`Reset the second factor of ${person.name}?`}
      confirmLabel="Reset second factor"
      variant="danger"
      busy={reset.isPending}
      error={reset.error}
      onClose={onClose}
      onConfirm={() => reset.mutate(person.id, { onSuccess: onClose })}
    >
      <p>
        Their authenticator app and recovery codes stop working and they are signed out everywhere. At their next
        sign-in they set up a new one{person.role === 'admin' ? ' before anything else opens' : ' if they choose to'}.
        Do this only when you are sure it is them asking, for instance in person.
      </p>
    </ConfirmDialog>
  );
}
