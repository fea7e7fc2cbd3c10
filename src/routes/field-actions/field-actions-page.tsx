import type { QueryClient } from '@tanstack/react-query';
import { Link, type LoaderFunctionArgs } from 'react-router';
import type { FieldActionState } from '../../../shared/schemas/field-actions';
import { fieldActionsQueryOptions, useFieldActions } from '../../api/field-actions/list-field-actions';
import { PageHeader } from '../../components/page-header';
import { Pager } from '../../components/pager';
import { Card } from '../../components/ui/card';
import { EmptyRow, Table, TableFrame, TBody, TD, TH, THead, TR } from '../../components/ui/table';
import { formatWhen } from '../../lib/format';
import { fieldActionHref, ncrHref, trailHref } from '../../lib/paths';
import { requirePermission } from '../../lib/session';
import { useUrlFilter } from '../../lib/use-url-filter';
import { FieldActionBadge } from './field-action-badge';

const stateOf = (raw: string | null): FieldActionState | undefined =>
  raw === 'open' || raw === 'closed' ? raw : undefined;

export const fieldActionsLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'field-actions.read');
    const q = new URL(request.url).searchParams;
    await queryClient.ensureQueryData(
      fieldActionsQueryOptions(stateOf(q.get('state') ?? 'open'), Number(q.get('page') ?? 1) || 1),
    );
    return null;
  };

const FILTERS: { value: string; label: string }[] = [
  { value: 'open', label: 'Open' },
  { value: 'closed', label: 'Decided' },
  { value: 'all', label: 'All' },
];

/** Problems found after a unit shipped: which unit, which customer, which NCR, and what was decided. */
export function FieldActionsPage() {
  const { params, setMany } = useUrlFilter();
  const state = params.get('state') ?? 'open';
  const page = Number(params.get('page') ?? 1) || 1;
  const list = useFieldActions(stateOf(state), page);
  return (
    <div className="mx-auto max-w-page">
      <PageHeader
        title="Field actions"
        description="A problem found in something that has already shipped. Quality decides, with a signature, what is done in the field."
      />
      <div role="group" aria-label="Show" className="mb-4 flex flex-wrap gap-2">
        {FILTERS.map((f) => (
          <button
            key={f.value}
            type="button"
            aria-pressed={state === f.value}
            onClick={() => setMany({ state: f.value, page: '' })}
            className={`min-h-11 floor:min-h-12 rounded-control border px-4 font-medium ${state === f.value ? 'border-accent bg-accent text-white' : 'border-rule-strong bg-card text-ink hover:border-accent'}`}
          >
            {f.label}
          </button>
        ))}
      </div>
      <Card as="div">
        <TableFrame label="Field actions" busy={list.isPlaceholderData}>
          <Table caption="Field actions">
            <THead>
              <TR>
                <TH>Number</TH>
                <TH>State</TH>
                <TH>Unit</TH>
                <TH>Customer and order</TH>
                <TH>Found by</TH>
                <TH wideOnly>Opened</TH>
              </TR>
            </THead>
            <TBody>
              {list.data?.rows.length ? (
                list.data.rows.map((fa) => (
                  <TR key={fa.number}>
                    <TD mono nowrap>
                      <Link to={fieldActionHref(fa.number)} className="font-semibold text-accent underline">
                        {fa.number}
                      </Link>
                    </TD>
                    <TD>
                      <FieldActionBadge fa={fa} />
                    </TD>
                    <TD mono nowrap>
                      <Link to={trailHref(fa.unit.serial)} className="text-accent underline">
                        {fa.unit.serial}
                      </Link>{' '}
                      <span className="text-ink-soft">{fa.unit.familyCode}</span>
                    </TD>
                    <TD>
                      {fa.shipment.customer ?? '—'}
                      <span className="block font-mono text-sm text-ink-soft">
                        {fa.shipment.reference} · shipped {fa.shipment.shipDate}
                      </span>
                    </TD>
                    <TD>
                      <Link to={ncrHref(fa.ncr.number)} className="font-mono text-accent underline">
                        {fa.ncr.number}
                      </Link>{' '}
                      on <span className="font-mono">{fa.ncr.subject}</span>
                    </TD>
                    <TD mono nowrap wideOnly>
                      {formatWhen(fa.openedAt)}
                    </TD>
                  </TR>
                ))
              ) : (
                <EmptyRow colSpan={6}>
                  {state === 'open' ? 'No field action is open.' : 'No field actions to show.'}
                </EmptyRow>
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
          noun={['field action', 'field actions']}
        />
      )}
    </div>
  );
}
