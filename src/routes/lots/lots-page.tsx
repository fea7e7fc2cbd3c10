import type { QueryClient } from '@tanstack/react-query';
import { Link, type LoaderFunctionArgs } from 'react-router';
import { INSPECTION_LABELS, INSPECTION_STATES, type InspectionState } from '../../../shared/schemas/lots';
import { useSignedIn } from '../../api/auth/me';
import { lotsQueryOptions, useLots, type LotFilter } from '../../api/lots/lots';
import { suppliersQueryOptions, useSuppliers } from '../../api/reference/suppliers';
import { FilterInput, FilterSelect } from '../../components/filter-fields';
import { PageHeader } from '../../components/page-header';
import { Pager } from '../../components/pager';
import { Button, ButtonLink } from '../../components/ui/button';
import { Card, CardFooter } from '../../components/ui/card';
import { Notice } from '../../components/ui/notice';
import { EmptyRow, Table, TableFrame, TBody, TD, TH, THead, TR } from '../../components/ui/table';
import { plural } from '../../lib/format';
import { receivedLotHref, paths } from '../../lib/paths';
import { requirePermission } from '../../lib/session';
import { useDebouncedText, useUrlFilter } from '../../lib/use-url-filter';
import { InspectionBadge, SameCode } from './lot-words';

const PAGE_SIZE = 25;

/** The list's filters and page live in the address; anything malformed there is left out. */
export function lotFilterFrom(params: URLSearchParams): LotFilter {
  const page = Number(params.get('page'));
  const supplierId = Number(params.get('supplier'));
  const inspection = params.get('inspection');
  const q = params.get('q')?.trim();
  const f: LotFilter = { page: Number.isInteger(page) && page > 0 ? page : 1, pageSize: PAGE_SIZE };
  if (q) f.q = q.slice(0, 60);
  if (Number.isInteger(supplierId) && supplierId > 0) f.supplierId = supplierId;
  if (inspection && (INSPECTION_STATES as readonly string[]).includes(inspection)) {
    f.inspection = inspection as InspectionState;
  }
  if (params.get('available') === 'true') f.available = 'true';
  return f;
}

export const lotsLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'lots.read');
    await Promise.all([
      queryClient.ensureQueryData(lotsQueryOptions(lotFilterFrom(new URL(request.url).searchParams))),
      queryClient.ensureQueryData(suppliersQueryOptions()),
    ]);
    return null;
  };

const inspectionOptions = INSPECTION_STATES.map((s) => ({ value: s, label: INSPECTION_LABELS[s] }));
const FILTER_KEYS = ['q', 'supplier', 'inspection', 'available'] as const;

/** Every purchased lot received, newest first: what is left of it, its inspection, its certificate. */
export function LotsPage() {
  const me = useSignedIn();
  const { params, set, setMany } = useUrlFilter();
  const filter = lotFilterFrom(params);
  const lots = useLots(filter);
  const suppliers = useSuppliers();
  const [draft, onSearch] = useDebouncedText(filter.q ?? '', (v) => set('q', v));
  const data = lots.data;
  const filtered = FILTER_KEYS.some((k) => params.get(k));
  const supplierOptions = (suppliers.data ?? []).map((s) => ({ value: String(s.id), label: s.name }));
  if (!me) return null;

  return (
    <>
      <PageHeader
        title="Purchased lots"
        description="Lots of new parts as receiving logged them. A build draws from an accepted lot until none is left; a lot waiting, on hold or refused cannot go into a unit."
        actions={
          me.can('lots.receive') && (
            <ButtonLink to={paths.receiveLot} variant="primary" icon="plus">
              Receive a lot
            </ButtonLink>
          )
        }
      />
      <Card labelledBy="lots-heading">
        <h2 id="lots-heading" className="sr-only">
          Lots received
        </h2>
        <form
          role="search"
          aria-label="Filter the lots"
          onSubmit={(e) => e.preventDefault()}
          className="grid grid-cols-2 gap-3 border-b border-rule px-5 py-4 md:grid-cols-4"
        >
          <div className="col-span-2">
            <FilterInput
              id="lots-q"
              label="Search"
              placeholder="Lot code or part number"
              value={draft}
              onChange={(v) => onSearch(v)}
            />
          </div>
          <FilterSelect
            id="lots-supplier"
            label="Supplier"
            placeholder="All suppliers"
            options={supplierOptions}
            value={filter.supplierId ? String(filter.supplierId) : ''}
            onChange={(v) => set('supplier', v)}
          />
          <FilterSelect
            id="lots-inspection"
            label="Inspection"
            placeholder="Any state"
            options={inspectionOptions}
            value={filter.inspection ?? ''}
            onChange={(v) => set('inspection', v)}
          />
          <div className="col-span-2 flex flex-wrap items-center justify-between gap-3 md:col-span-4">
            <label className="flex min-h-11 items-center gap-2 floor:min-h-12">
              <input
                type="checkbox"
                className="size-5 floor:size-6"
                checked={filter.available === 'true'}
                onChange={(e) => set('available', e.target.checked ? 'true' : '')}
              />
              Only lots a build can draw from
            </label>
            <p aria-live="polite" className="font-medium">
              {data ? plural(data.total, 'lot') : '…'}
              {filtered && <span className="font-normal text-ink-soft"> match these filters</span>}
            </p>
            {filtered && (
              <Button onClick={() => setMany(Object.fromEntries(FILTER_KEYS.map((k) => [k, ''])))}>
                Clear filters
              </Button>
            )}
          </div>
        </form>
        {lots.error && (
          <div className="px-5 pt-4">
            <Notice tone="bad" live="alert">
              {lots.error.message}
            </Notice>
          </div>
        )}
        {data && (
          <TableFrame label="Purchased lots" busy={lots.isPlaceholderData}>
            <Table caption={plural(data.total, 'lot')}>
              <THead>
                <TR>
                  <TH>Received</TH>
                  <TH>Lot code</TH>
                  <TH>Part number</TH>
                  <TH>Part</TH>
                  <TH wideOnly>Supplier</TH>
                  <TH align="right">Left</TH>
                  <TH>Inspection</TH>
                  <TH wideOnly>Certificate</TH>
                </TR>
              </THead>
              <TBody>
                {data.rows.length === 0 && (
                  <EmptyRow colSpan={8}>{filtered ? 'No lot matches these filters.' : 'No lot received yet.'}</EmptyRow>
                )}
                {data.rows.map((l) => (
                  <TR key={l.id} muted={!l.drawable.ok}>
                    <TD mono nowrap>
                      {l.receivedOn}
                    </TD>
                    <TD mono>
                      <Link to={receivedLotHref(l.id)} className="text-accent underline">
                        {l.lotCode}
                      </Link>
                      <SameCode lot={l} />
                    </TD>
                    <TD mono nowrap>
                      {l.partNumber}
                    </TD>
                    <TD>{l.kindLabel}</TD>
                    <TD wideOnly>{l.supplier.name}</TD>
                    <TD mono align="right" nowrap>
                      {l.quantityLeft} / {l.quantityReceived}
                    </TD>
                    <TD>
                      <InspectionBadge state={l.inspection} />
                    </TD>
                    <TD wideOnly>
                      {l.certificate ? (
                        <a href={l.certificate.url} className="text-accent underline">
                          PDF
                        </a>
                      ) : (
                        <span className="text-ink-soft">None on file</span>
                      )}
                    </TD>
                  </TR>
                ))}
              </TBody>
            </Table>
          </TableFrame>
        )}
        {data && (
          <CardFooter>
            <Pager
              page={data.page}
              pageSize={data.pageSize}
              total={data.total}
              noun={['lot', 'lots']}
              onPage={(p) => set('page', String(p))}
            />
          </CardFooter>
        )}
      </Card>
    </>
  );
}
