import type { QueryClient } from '@tanstack/react-query';
import { Link, type LoaderFunctionArgs } from 'react-router';
import { CA_STATES, type CaState } from '../../../shared/schemas/corrective-action';
import { useSignedIn } from '../../api/auth/me';
import { casQueryOptions, useCas } from '../../api/corrective-actions/list-cas';
import { useActions } from '../../api/corrective-actions/list-actions';
import { PageHeader } from '../../components/page-header';
import { Pager } from '../../components/pager';
import { ButtonLink } from '../../components/ui/button';
import { Badge } from '../../components/ui/badge';
import { Card, CardHeader } from '../../components/ui/card';
import { EmptyRow, Table, TableFrame, TBody, TD, TH, THead, TR } from '../../components/ui/table';
import { formatWhen } from '../../lib/format';
import { caHref, paths } from '../../lib/paths';
import { requirePermission } from '../../lib/session';
import { useUrlFilter } from '../../lib/use-url-filter';
import { CaStateBadge, sourceHref, TaskStateBadge } from './ca-words';

const VIEWS: { value: string; label: string }[] = [
  { value: 'open', label: 'Open' },
  { value: 'closed', label: 'Closed' },
  { value: 'all', label: 'All' },
];

function stateOf(params: URLSearchParams): CaState | undefined {
  const v = params.get('state') ?? 'open';
  return (CA_STATES as readonly string[]).includes(v) ? (v as CaState) : undefined;
}

export const caListLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'corrective-actions.read');
    const params = new URL(request.url).searchParams;
    await queryClient.ensureQueryData(casQueryOptions(stateOf(params), Number(params.get('page') ?? 1) || 1));
    return null;
  };

/** Open actions across corrective actions by due date: the caller's own, or everyone's for quality. */
function ActionsDue({ everyone }: { everyone: boolean }) {
  const list = useActions(everyone ? 'anyone' : 'me');
  const rows = (list.data?.rows ?? []).filter((t) => !t.doneAt);
  return (
    <Card labelledBy="actions-due">
      <CardHeader
        id="actions-due"
        title={everyone ? 'Actions not yet done' : 'Your actions'}
        description="Across every open corrective action, the earliest due first. Overdue ones are mailed to their owner each day."
      />
      <TableFrame label="Actions not yet done">
        <Table caption="Actions not yet done">
          <THead>
            <TR>
              <TH>Due</TH>
              <TH>Action</TH>
              <TH>Owner</TH>
              <TH>Corrective action</TH>
            </TR>
          </THead>
          <TBody>
            {rows.length ? (
              rows.map((t) => (
                <TR key={t.id}>
                  <TD nowrap>
                    <span className="mr-2 font-mono">{t.dueOn}</span>
                    <TaskStateBadge t={t} />
                  </TD>
                  <TD>{t.description}</TD>
                  <TD nowrap>{t.owner.name}</TD>
                  <TD>
                    <Link to={caHref(t.correctiveAction.number)} className="font-mono text-accent underline">
                      {t.correctiveAction.number}
                    </Link>{' '}
                    <span className="text-ink-soft">{t.correctiveAction.title}</span>
                  </TD>
                </TR>
              ))
            ) : (
              <EmptyRow colSpan={4}>Nothing waiting.</EmptyRow>
            )}
          </TBody>
        </Table>
      </TableFrame>
    </Card>
  );
}

export function CaListPage() {
  const me = useSignedIn();
  const { params, setMany } = useUrlFilter();
  const view = params.get('state') ?? 'open';
  const page = Number(params.get('page') ?? 1) || 1;
  const list = useCas(stateOf(params), page);
  const manages = me?.can('corrective-actions.manage') ?? false;
  return (
    <div className="mx-auto max-w-page">
      <PageHeader
        title="Corrective actions"
        description="One record per problem, answering one or many NCRs and claims: who works on it, how it is contained, its root cause, the actions with owners and due dates, and the proof that it worked."
        actions={
          manages && (
            <ButtonLink to={paths.openCa} variant="primary" icon="plus">
              Open a corrective action
            </ButtonLink>
          )
        }
      />
      <div className="flex flex-col gap-5">
        <ActionsDue everyone={manages} />
        <Card labelledBy="cas-heading">
          <CardHeader
            id="cas-heading"
            title="Records"
            actions={
              <div role="group" aria-label="Show" className="flex flex-wrap gap-2">
                {VIEWS.map((v) => (
                  <button
                    key={v.value}
                    type="button"
                    aria-pressed={view === v.value}
                    onClick={() => setMany({ state: v.value === 'open' ? '' : v.value })}
                    className={`min-h-11 floor:min-h-12 rounded-control border px-4 font-medium ${view === v.value ? 'border-accent bg-accent text-white' : 'border-rule-strong bg-card text-ink hover:border-accent'}`}
                  >
                    {v.label}
                  </button>
                ))}
              </div>
            }
          />
          <TableFrame label="Corrective actions" busy={list.isPlaceholderData}>
            <Table caption="Corrective actions">
              <THead>
                <TR>
                  <TH>Number</TH>
                  <TH>State</TH>
                  <TH>Problem</TH>
                  <TH>From</TH>
                  <TH align="right">Actions done</TH>
                  <TH>Opened</TH>
                </TR>
              </THead>
              <TBody>
                {list.data?.rows.length ? (
                  list.data.rows.map((ca) => (
                    <TR key={ca.number}>
                      <TD mono nowrap>
                        <Link to={caHref(ca.number)} className="font-semibold text-accent underline">
                          {ca.number}
                        </Link>
                      </TD>
                      <TD nowrap>
                        <CaStateBadge state={ca.state} />
                      </TD>
                      <TD>{ca.title}</TD>
                      <TD>
                        <span className="flex flex-wrap gap-x-2 font-mono text-sm">
                          {ca.sources.map((s) => (
                            <Link key={s} to={sourceHref(s)} className="text-accent underline">
                              {s}
                            </Link>
                          ))}
                        </span>
                      </TD>
                      <TD align="right" nowrap>
                        <span className="font-mono">
                          {ca.tasks.done}/{ca.tasks.total}
                        </span>
                        {ca.tasks.overdue > 0 && (
                          <span className="ml-2">
                            <Badge tone="bad">{ca.tasks.overdue} overdue</Badge>
                          </span>
                        )}
                      </TD>
                      <TD nowrap>
                        <span className="font-mono">{formatWhen(ca.openedAt)}</span>
                        <span className="block text-sm text-ink-soft">{ca.openedBy}</span>
                      </TD>
                    </TR>
                  ))
                ) : (
                  <EmptyRow colSpan={6}>No corrective actions to show here.</EmptyRow>
                )}
              </TBody>
            </Table>
          </TableFrame>
        </Card>
        {list.data && (
          <Pager
            page={list.data.page}
            pageSize={list.data.pageSize}
            total={list.data.total}
            onPage={(p) => setMany({ page: String(p) })}
            noun={['corrective action', 'corrective actions']}
          />
        )}
      </div>
    </div>
  );
}
