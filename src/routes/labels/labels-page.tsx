import type { QueryClient } from '@tanstack/react-query';
import { useQueries } from '@tanstack/react-query';
import { useId, useState } from 'react';
import type { LoaderFunctionArgs } from 'react-router';
import { parseSerial } from '../../../shared/domain/serial';
import { labelStocks } from '../../../shared/schemas/intake';
import { itemQueryOptions } from '../../api/items/item';
import { useRecordLabelsPrinted } from '../../api/items/labels-printed';
import { ApiError } from '../../lib/http';
import { PageHeader } from '../../components/page-header';
import { ScanBox } from '../../components/scan-box';
import { Button } from '../../components/ui/button';
import { Card, CardBody } from '../../components/ui/card';
import { Icon } from '../../components/ui/icon';
import { Notice } from '../../components/ui/notice';
import type { LabelStock } from '../../lib/paths';
import { requirePermission } from '../../lib/session';
import { useUrlFilter } from '../../lib/use-url-filter';
import { LabelCard, STOCKS } from './label-card';

/** The serials asked for, checked and in their printed form, each once; and those that are not serials. */
export function labelSerials(params: URLSearchParams) {
  const raw = (params.get('serials') ?? '')
    .split(',')
    .map((s) => s.trim())
    .filter(Boolean);
  const serials: string[] = [];
  const bad: string[] = [];
  for (const r of raw) {
    const p = parseSerial(r);
    if (!p.ok) bad.push(r);
    else if (!serials.includes(p.serial)) serials.push(p.serial);
  }
  const s = params.get('stock');
  const stock: LabelStock = (labelStocks as readonly string[]).includes(s ?? '') ? (s as LabelStock) : '2x1in';
  return { serials: serials.slice(0, 100), bad, stock };
}

export const labelsLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'labels.print');
    const { serials } = labelSerials(new URL(request.url).searchParams);
    // a label whose item is missing still shows, with the server's reason, so no await on each
    serials.forEach((s) => void queryClient.prefetchQuery(itemQueryOptions(s)));
    return null;
  };

export function LabelsPage() {
  const { params, set, setMany } = useUrlFilter();
  const { serials, bad, stock } = labelSerials(params);
  const items = useQueries({ queries: serials.map((s) => itemQueryOptions(s)) });
  const printed = useRecordLabelsPrinted();
  const stockId = useId();
  const missing = serials.filter((_, i) => items[i]?.error);
  const printable = serials.filter((_, i) => items[i]?.data);

  const setSerials = (list: string[]) => setMany({ serials: list.join(',') });
  // the print is logged once the browser reports its print dialog closed and the person says the
  // labels came out: a cancelled dialog logs nothing
  const [asking, setAsking] = useState(false);
  const [needsReason, setNeedsReason] = useState(false);
  const [reason, setReason] = useState('');
  const onPrint = () => {
    printed.reset();
    setNeedsReason(false);
    window.addEventListener('afterprint', () => setAsking(true), { once: true });
    window.print();
  };
  const logPrint = async () => {
    try {
      await printed.mutateAsync({ serials: printable, stock, ...(needsReason ? { reprintReason: reason } : {}) });
      setAsking(false);
      setReason('');
      setNeedsReason(false);
    } catch (err) {
      if (err instanceof ApiError && err.fields?.reprintReason) setNeedsReason(true);
    }
  };
  const reprints = printed.data?.printed.filter((p) => p.reprint).length ?? 0;

  return (
    <>
      <div className="print:hidden">
        <PageHeader
          title="Labels"
          description="QR labels at their printed size, one label to a printed page. Each print is logged; a second print is logged as a reprint."
          actions={
            <Button
              variant="primary"
              size="lg"
              icon="print"
              onClick={onPrint}
              disabled={printable.length === 0 || printed.isPending}
              aria-busy={printed.isPending}
            >
              Print
            </Button>
          }
        />
        <div className="mb-5 grid grid-cols-1 gap-5 lg:grid-cols-[minmax(0,1.5fr)_minmax(0,1fr)]">
          <Card labelledBy="add-heading">
            <CardBody>
              <h2 id="add-heading" className="mb-2 font-semibold">
                Add a label
              </h2>
              <ScanBox
                preview={false}
                onItem={(item) => setSerials([...serials.filter((s) => s !== item.serial), item.serial])}
              />
            </CardBody>
          </Card>
          <Card labelledBy={stockId}>
            <CardBody>
              <div role="radiogroup" aria-labelledby={stockId} className="flex flex-col gap-2">
                <h2 id={stockId} className="font-semibold">
                  Label stock
                </h2>
                {STOCKS.map((s) => (
                  <label
                    key={s.value}
                    className="flex min-h-11 floor:min-h-12 cursor-pointer items-center gap-2.5 rounded-control border border-rule-strong bg-field px-3 has-checked:border-2 has-checked:border-accent has-checked:bg-accent-tint has-checked:font-semibold"
                  >
                    <input
                      type="radio"
                      name="label-stock"
                      className="size-5 accent-accent"
                      checked={stock === s.value}
                      onChange={() => set('stock', s.value)}
                    />
                    {s.label}
                  </label>
                ))}
                <p className="text-sm text-ink-soft">Set the printer to the same stock, at 100 % scale.</p>
              </div>
            </CardBody>
          </Card>
        </div>
        <div className="mb-4 flex flex-col gap-3">
          {asking && (
            <Notice tone="info" live="status" title="Did the labels come out of the printer?">
              <p>The print is logged only when they did; a cancelled print logs nothing.</p>
              {needsReason && (
                <label className="mt-3 flex flex-col gap-1">
                  <span className="font-semibold">Printed before: why again?</span>
                  <textarea
                    value={reason}
                    onChange={(e) => setReason(e.target.value)}
                    maxLength={300}
                    className="min-h-20 rounded-control border border-rule-strong bg-card px-3 py-2"
                  />
                </label>
              )}
              <div className="mt-3 flex flex-wrap gap-2">
                <Button variant="primary" onClick={() => void logPrint()} disabled={printed.isPending}>
                  {needsReason ? 'Log the reprint' : 'Yes, log the print'}
                </Button>
                <Button onClick={() => setAsking(false)}>No, nothing printed</Button>
              </div>
            </Notice>
          )}
          {printed.error && !(printed.error instanceof ApiError && printed.error.fields?.reprintReason) && (
            <Notice tone="bad" live="alert" title="The print was not logged">
              {printed.error.message}
            </Notice>
          )}
          {printed.data && (
            <Notice tone="ok" live="status" title="Print logged">
              {printed.data.printed.length} label{printed.data.printed.length === 1 ? '' : 's'}
              {reprints > 0 ? `, ${reprints} of them reprinted.` : ', all printed for the first time.'}
            </Notice>
          )}
          {bad.length > 0 && (
            <Notice tone="bad" title="Not serials">
              These are not valid serials and were left out: <span className="font-mono">{bad.join(', ')}</span>
            </Notice>
          )}
          {missing.length > 0 && (
            <Notice tone="bad" title="Not on file">
              No item has these serials, so they are not printed:{' '}
              <span className="font-mono">{missing.join(', ')}</span>
              <div className="mt-2">
                <Button size="sm" onClick={() => setSerials(serials.filter((s) => !missing.includes(s)))}>
                  Take them off the sheet
                </Button>
              </div>
            </Notice>
          )}
        </div>
      </div>
      {serials.length === 0 ? (
        <p className="text-ink-soft print:hidden">No labels yet. Scan or type a serial above to add one.</p>
      ) : (
        <ul aria-label="Labels to print" className="flex flex-wrap gap-6 print:block">
          {serials.map((s, i) =>
            items[i]?.error ? null : (
              <li key={s} className="flex flex-col gap-2 print:block">
                <LabelCard serial={s} item={items[i]?.data} stock={stock} />
                <div className="flex flex-wrap gap-2 print:hidden">
                  <a
                    href={`/api/items/${encodeURIComponent(s)}/label.png`}
                    download={`${s}.png`}
                    aria-label={`Download PNG for ${s}`}
                    className="inline-flex min-h-11 floor:min-h-12 items-center gap-1.5 px-1 text-accent underline-offset-4 hover:underline"
                  >
                    <Icon name="download" size={16} />
                    Download PNG
                  </a>
                  <Button
                    size="sm"
                    aria-label={`Remove label ${s}`}
                    onClick={() => setSerials(serials.filter((x) => x !== s))}
                  >
                    Remove
                  </Button>
                </div>
              </li>
            ),
          )}
        </ul>
      )}
    </>
  );
}
