import type { QueryClient } from '@tanstack/react-query';
import { Link, type LoaderFunctionArgs } from 'react-router';
import type { ClaimListQuery } from '../../../shared/schemas/warranty';
import { useSignedIn, type SignedIn } from '../../api/auth/me';
import { claimsQueryOptions, useClaims, type ClaimFilter } from '../../api/warranty/claims';
import { PageHeader } from '../../components/page-header';
import { Pager } from '../../components/pager';
import { ButtonLink } from '../../components/ui/button';
import { Card } from '../../components/ui/card';
import { Input } from '../../components/ui/input';
import { Badge } from '../../components/ui/badge';
import { EmptyRow, Table, TableFrame, TBody, TD, TH, THead, TR } from '../../components/ui/table';
import { formatWhen } from '../../lib/format';
import { claimHref, paths, trailHref } from '../../lib/paths';
import { requirePermission } from '../../lib/session';
import { useDebouncedText, useUrlFilter } from '../../lib/use-url-filter';
import { ClaimStateBadge, CoveredBadge, DecisionBadge, distanceWords, NEXT_WORDS } from './claim-words';

type View = { value: string; label: string; filter: ClaimFilter };
const VIEWS: View[] = [
  { value: 'open', label: 'Open', filter: { state: 'open' } },
  { value: 'return', label: 'To take back', filter: { waiting: 'return' } },
  { value: 'teardown', label: 'To tear down', filter: { waiting: 'teardown' } },
  { value: 'decision', label: 'To decide or close', filter: { waiting: 'decision' } },
  { value: 'closed', label: 'Closed', filter: { state: 'closed' } },
  { value: 'all', label: 'All', filter: {} },
];

/** Each role opens on the claims that wait for it. */
function defaultView(me: SignedIn | null) {
  if (me?.can('warranty.return')) return 'return';
  if (me?.can('warranty.teardown')) return 'teardown';
  return 'open';
}

function filterOf(params: URLSearchParams, me: SignedIn | null): ClaimFilter {
  const view = VIEWS.find((v) => v.value === (params.get('view') ?? defaultView(me))) ?? VIEWS[0]!;
  const q = params.get('q')?.trim() || undefined;
  return { ...view.filter, q, page: Number(params.get('page') ?? 1) || 1 } as Partial<ClaimListQuery>;
}

export const claimsLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    const me = await requirePermission(queryClient, request, 'warranty.read');
    await queryClient.ensureQueryData(claimsQueryOptions(filterOf(new URL(request.url).searchParams, me)));
    return null;
  };

export function ClaimsPage() {
  const me = useSignedIn();
  const { params, setMany } = useUrlFilter();
  const view = params.get('view') ?? defaultView(me);
  const filter = filterOf(params, me);
  const list = useClaims(filter);
  const [text, setText] = useDebouncedText(params.get('q') ?? '', (v) => setMany({ q: v }));
  return (
    <div className="mx-auto max-w-page">
      <PageHeader
        title="Warranty claims"
        description="Every claim by serial: whether it was covered when logged, the unit back at the plant, what its teardown found, and the decision."
        actions={
          <>
            {me?.can('warranty.analysis') && <ButtonLink to={paths.warrantyAnalysis}>Analysis</ButtonLink>}
            {me?.can('warranty.record') && (
              <ButtonLink to={paths.logClaim} variant="primary" icon="plus">
                Log a claim
              </ButtonLink>
            )}
          </>
        }
      />
      <div className="mb-4 flex flex-wrap items-end justify-between gap-3">
        <div role="group" aria-label="Show" className="flex flex-wrap gap-2">
          {VIEWS.map((v) => (
            <button
              key={v.value}
              type="button"
              aria-pressed={view === v.value}
              onClick={() => setMany({ view: v.value, page: '' })}
              className={`min-h-11 floor:min-h-12 rounded-control border px-4 font-medium ${view === v.value ? 'border-accent bg-accent text-white' : 'border-rule-strong bg-card text-ink hover:border-accent'}`}
            >
              {v.label}
            </button>
          ))}
        </div>
        <label className="flex w-64 flex-col gap-1 text-sm font-medium">
          Find
          <Input
            type="search"
            value={text}
            onChange={(e) => setText(e.target.value)}
            placeholder="Claim, serial or customer"
          />
        </label>
      </div>
      <Card as="div">
        <TableFrame label="Claims" busy={list.isPlaceholderData}>
          <Table caption="Warranty claims">
            <THead>
              <TR>
                <TH>Claim</TH>
                <TH>State</TH>
                <TH>Unit</TH>
                <TH>Customer</TH>
                <TH wideOnly>Failed</TH>
                <TH align="right" wideOnly>
                  Distance · hours
                </TH>
                <TH>Cover</TH>
                <TH>Waiting for</TH>
                <TH wideOnly>Logged</TH>
              </TR>
            </THead>
            <TBody>
              {list.data?.rows.length ? (
                list.data.rows.map((c) => (
                  <TR key={c.number}>
                    <TD mono nowrap>
                      <Link to={claimHref(c.number)} className="font-semibold text-accent underline">
                        {c.number}
                      </Link>
                      {c.demo && (
                        <span className="ml-2">
                          <Badge tone="off" icon={null}>
                            Demo
                          </Badge>
                        </span>
                      )}
                    </TD>
                    <TD nowrap>
                      <ClaimStateBadge state={c.state} />
                    </TD>
                    <TD mono nowrap>
                      {me?.can('trail.read') ? (
                        <Link to={trailHref(c.unit.serial)} className="text-accent underline">
                          {c.unit.serial}
                        </Link>
                      ) : (
                        c.unit.serial
                      )}{' '}
                      <span className="text-ink-soft">{c.unit.familyCode}</span>
                    </TD>
                    <TD>{c.customer}</TD>
                    <TD mono nowrap wideOnly>
                      {c.failedOn}
                    </TD>
                    <TD align="right" nowrap wideOnly>
                      {distanceWords(c.distanceKm, c.hours)}
                    </TD>
                    <TD nowrap>
                      <CoveredBadge covered={c.covered} />
                    </TD>
                    <TD>{c.decision ? <DecisionBadge decision={c.decision} /> : c.next ? NEXT_WORDS[c.next] : '—'}</TD>
                    <TD mono nowrap wideOnly>
                      {formatWhen(c.openedAt)}
                    </TD>
                  </TR>
                ))
              ) : (
                <EmptyRow colSpan={9}>No claims to show here.</EmptyRow>
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
          noun={['claim', 'claims']}
        />
      )}
    </div>
  );
}
