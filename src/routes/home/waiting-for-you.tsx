import { Link } from 'react-router';
import type { SignedIn } from '../../api/auth/me';
import { useFieldActions } from '../../api/field-actions/list-field-actions';
import { useNcrs } from '../../api/ncrs/list-ncrs';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Icon } from '../../components/ui/icon';
import { formatWhen, plural } from '../../lib/format';
import { fieldActionHref, ncrHref, paths } from '../../lib/paths';
import { ActionsWaiting, ClaimsWaiting, claimTurnOf } from './waiting-claims';

/** Countersignatures a quality engineer owes: each one a tap from its NCR. */
function AwaitingSignature() {
  const list = useNcrs({ page: 1, pageSize: 20, sort: 'raised', dir: 'asc', awaiting: 'me' });
  const rows = list.data?.rows ?? [];
  return (
    <Card labelledBy="awaiting-heading">
      <CardHeader
        id="awaiting-heading"
        title={`Awaiting your signature (${list.data?.total ?? '…'})`}
        description="A critical use-as-is takes effect only when a second quality engineer signs it."
      />
      <CardBody>
        {rows.length === 0 ? (
          <p className="text-ink-soft">Nothing is waiting for your signature.</p>
        ) : (
          <ul className="flex flex-col divide-y divide-rule">
            {rows.map((n) => (
              <li key={n.number} className="py-2">
                <Link
                  to={ncrHref(n.number)}
                  className="flex min-h-11 floor:min-h-12 flex-wrap items-center gap-x-3 text-accent underline-offset-4 hover:underline"
                >
                  <Icon name="key" size={18} />
                  <span className="font-mono font-semibold">{n.number}</span>
                  <span className="text-ink">{n.serial ?? n.lotCode}</span>
                  <span className="text-ink-soft">{n.description}</span>
                </Link>
              </li>
            ))}
          </ul>
        )}
      </CardBody>
    </Card>
  );
}

/** Problems found after shipping that are still open: the warranty desk follows them. */
function OpenFieldActions() {
  const list = useFieldActions('open');
  const rows = list.data?.rows ?? [];
  return (
    <Card labelledBy="open-fa-heading">
      <CardHeader
        id="open-fa-heading"
        title={`Open field actions (${list.data?.total ?? '…'})`}
        description="Problems found in units that have already shipped, waiting for quality's decision."
      />
      <CardBody>
        {rows.length === 0 ? (
          <p className="text-ink-soft">No field action is open.</p>
        ) : (
          <ul className="flex flex-col divide-y divide-rule">
            {rows.slice(0, 8).map((fa) => (
              <li key={fa.number} className="py-2">
                <Link
                  to={fieldActionHref(fa.number)}
                  className="flex min-h-11 floor:min-h-12 flex-wrap items-center gap-x-3 text-accent underline-offset-4 hover:underline"
                >
                  <Icon name="hold" size={18} />
                  <span className="font-mono font-semibold">{fa.number}</span>
                  <span className="font-mono text-ink">{fa.unit.serial}</span>
                  <span className="text-ink">{fa.shipment.customer ?? ''}</span>
                  <span className="text-ink-soft">opened {formatWhen(fa.openedAt)}</span>
                </Link>
              </li>
            ))}
          </ul>
        )}
        {rows.length > 8 && (
          <p className="mt-2">
            <Link to={paths.fieldActions} className="text-accent underline">
              All {plural(list.data!.total, 'open field action')}
            </Link>
          </p>
        )}
      </CardBody>
    </Card>
  );
}

/** What waits for this person now, before the list of what they can do. */
export function WaitingForYou({ me }: { me: SignedIn }) {
  const signs = me.can('ncr.disposition');
  const follows = me.can('field-actions.read') && (me.user.role === 'warranty' || me.user.role === 'quality');
  const claimTurn = claimTurnOf(me);
  return (
    <section aria-label="Waiting for you" className="mb-8 grid grid-cols-1 gap-5 empty:hidden xl:grid-cols-2">
      {signs && <AwaitingSignature />}
      {claimTurn && <ClaimsWaiting waiting={claimTurn} />}
      {follows && <OpenFieldActions />}
      {me.can('corrective-actions.read') && <ActionsWaiting everyone={me.can('corrective-actions.manage')} />}
    </section>
  );
}
