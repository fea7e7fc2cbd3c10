import { useLiftLockout, useLockouts } from '../../../api/lockouts/lockouts';
import { Button } from '../../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../../components/ui/card';
import { Notice } from '../../../components/ui/notice';
import { formatWhen } from '../../../lib/format';

const WHY = { 'sign-in': 'failed sign-ins', password: 'wrong passwords when signing' } as const;

/**
 * Accounts and addresses refused after too many failures, and a way to let them back in at once
 * (a floor of tablets that mistyped a shared password need not wait out the window). Lifting is
 * audited. Shown above the people list only while there is one. The list is this server process's:
 * see docs/operations.md for several processes.
 */
export function LockoutsCard() {
  const lockouts = useLockouts();
  const lift = useLiftLockout();
  const data = lockouts.data;
  const none = data && data.accounts.length === 0 && data.addresses.length === 0;
  if (none && !lift.error) return null;

  return (
    <Card labelledBy="lockouts-heading">
      <CardHeader
        id="lockouts-heading"
        title="Locked out"
        description="Who cannot sign in, or sign with their password, after too many failures: until the time shown, or until you lift it."
      />
      <CardBody>
        {lockouts.error && (
          <Notice tone="bad" live="alert">
            {lockouts.error.message}
          </Notice>
        )}
        {lift.error && (
          <Notice tone="bad" live="alert">
            {lift.error.message}
          </Notice>
        )}
        {data && !none && (
          <ul className="flex flex-col divide-y divide-rule" aria-label="Lock-outs">
            {data.accounts.map((a) => (
              <li key={`${a.kind}-${a.email}`} className="flex flex-wrap items-center justify-between gap-3 py-2.5">
                <span>
                  <span className="font-medium">{a.name ?? 'No such person'}</span>{' '}
                  <span className="font-mono text-sm text-ink-soft">{a.email}</span>
                  <span className="block text-sm text-ink-soft">
                    {a.failures} {WHY[a.kind]}; locked until {formatWhen(a.until)}
                  </span>
                </span>
                <Button
                  aria-label={`Lift the lock-out of ${a.name ?? a.email}`}
                  disabled={lift.isPending}
                  onClick={() => lift.mutate({ email: a.email })}
                >
                  Lift lock-out
                </Button>
              </li>
            ))}
            {data.addresses.map((a) => (
              <li key={`address-${a.address}`} className="flex flex-wrap items-center justify-between gap-3 py-2.5">
                <span>
                  <span className="font-medium">Address</span> <span className="font-mono text-sm">{a.address}</span>
                  <span className="block text-sm text-ink-soft">
                    {a.failures} failed sign-ins from it; locked until {formatWhen(a.until)}
                  </span>
                </span>
                <Button
                  aria-label={`Lift the lock-out of address ${a.address}`}
                  disabled={lift.isPending}
                  onClick={() => lift.mutate({ address: a.address })}
                >
                  Lift lock-out
                </Button>
              </li>
            ))}
          </ul>
        )}
      </CardBody>
    </Card>
  );
}
