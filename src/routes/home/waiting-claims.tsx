import { Link } from 'react-router';
import type { SignedIn } from '../../api/auth/me';
import { useActions } from '../../api/corrective-actions/list-actions';
import { useClaims } from '../../api/warranty/claims';
import { Badge } from '../../components/ui/badge';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Icon } from '../../components/ui/icon';
import { plural } from '../../lib/format';
import { t as tr } from '../../lib/i18n';
import { caHref, claimHref, paths } from '../../lib/paths';

type Waiting = 'return' | 'teardown' | 'decision';

/** Whose turn a claim is: receiving takes units back, the floor tears them down, the desk decides. */
export function claimTurnOf(me: SignedIn): Waiting | null {
  if (me.can('warranty.return')) return 'return';
  if (me.can('warranty.teardown')) return 'teardown';
  if (me.can('warranty.record')) return 'decision';
  return null;
}

const TITLES: Record<Waiting, string> = {
  return: 'Units to take back',
  teardown: 'Returned units to tear down',
  decision: 'Claims to decide or close',
};

export function ClaimsWaiting({ waiting }: { waiting: Waiting }) {
  const list = useClaims({ waiting, pageSize: 8 });
  const rows = list.data?.rows ?? [];
  return (
    <Card labelledBy="claims-waiting-heading">
      <CardHeader
        id="claims-waiting-heading"
        title={tr(
          `home.claims.${waiting}`,
          { n: list.data?.total ?? '…' },
          `${TITLES[waiting]} (${list.data?.total ?? '…'})`,
        )}
        description={tr('home.claims.description')}
      />
      <CardBody>
        {rows.length === 0 ? (
          <p className="text-ink-soft">{tr('home.claims.empty')}</p>
        ) : (
          <ul className="flex flex-col divide-y divide-rule">
            {rows.map((c) => (
              <li key={c.number} className="py-1">
                <Link
                  to={claimHref(c.number)}
                  className="flex min-h-11 floor:min-h-12 flex-wrap items-center gap-x-3 text-accent underline-offset-4 hover:underline"
                >
                  <Icon name="arrowRight" size={18} />
                  <span className="font-mono font-semibold">{c.number}</span>
                  <span className="font-mono text-ink">{c.unit.serial}</span>
                  <span className="text-ink-soft">{c.customer}</span>
                </Link>
              </li>
            ))}
          </ul>
        )}
        {(list.data?.total ?? 0) > rows.length && (
          <p className="mt-2">
            <Link to={`${paths.warrantyClaims}?view=${waiting}`} className="text-accent underline">
              {tr('home.claims.all', { count: list.data!.total })}
            </Link>
          </p>
        )}
      </CardBody>
    </Card>
  );
}

/**
 * Corrective-action actions not yet done: the person's own, or for quality everyone's. Shown only
 * when there are some, so a home without any stays as it was; overdue ones come first and say so.
 */
export function ActionsWaiting({ everyone }: { everyone: boolean }) {
  const list = useActions(everyone ? 'anyone' : 'me');
  const rows = (list.data?.rows ?? []).filter((t) => !t.doneAt);
  if (!rows.length) return null;
  const overdue = rows.filter((t) => t.overdue).length;
  return (
    <Card labelledBy="actions-waiting-heading">
      <CardHeader
        id="actions-waiting-heading"
        title={`${everyone ? 'Corrective-action actions open' : 'Your corrective-action actions'} (${rows.length})`}
        description={
          overdue ? `${plural(overdue, 'action is', 'actions are')} overdue.` : 'None overdue; the earliest due first.'
        }
      />
      <CardBody>
        <ul className="flex flex-col divide-y divide-rule">
          {rows.slice(0, 8).map((t) => (
            <li key={t.id} className="py-1">
              <Link
                to={caHref(t.correctiveAction.number)}
                className="flex min-h-11 floor:min-h-12 flex-wrap items-center gap-x-3 text-accent underline-offset-4 hover:underline"
              >
                {t.overdue ? (
                  <Badge tone="bad">Overdue since {t.dueOn}</Badge>
                ) : (
                  <Badge tone="wait">Due {t.dueOn}</Badge>
                )}
                <span className="font-mono font-semibold">{t.correctiveAction.number}</span>
                <span className="text-ink">{t.description}</span>
                {everyone && <span className="text-ink-soft">{t.owner.name}</span>}
              </Link>
            </li>
          ))}
        </ul>
        {rows.length > 8 && (
          <p className="mt-2">
            <Link to={paths.correctiveActions} className="text-accent underline">
              All {plural(rows.length, 'open action')}
            </Link>
          </p>
        )}
      </CardBody>
    </Card>
  );
}
