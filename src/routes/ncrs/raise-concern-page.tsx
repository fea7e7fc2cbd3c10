import type { QueryClient } from '@tanstack/react-query';
import { useId, useState } from 'react';
import type { LoaderFunctionArgs } from 'react-router';
import { parseSerial } from '../../../shared/domain/serial';
import { useSignedIn } from '../../api/auth/me';
import { defectCodesQueryOptions } from '../../api/defect-codes/defect-codes';
import { itemQueryOptions, useItem } from '../../api/items/item';
import type { NcrDetail } from '../../api/ncrs/types';
import { suppliersQueryOptions } from '../../api/reference/suppliers';
import { ItemSummary } from '../../components/item-summary';
import { PageHeader } from '../../components/page-header';
import { ScanBox } from '../../components/scan-box';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Notice } from '../../components/ui/notice';
import { requirePermission } from '../../lib/session';
import { useUrlFilter } from '../../lib/use-url-filter';
import { ConcernForm, Raised, type ConcernAbout } from './concern-form';

export const raiseConcernLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'ncr.raise');
    const search = new URL(request.url).searchParams;
    const parsed = parseSerial(search.get('serial') ?? '');
    await Promise.all([
      queryClient.ensureQueryData(defectCodesQueryOptions()),
      // a serial that cannot be found is said beside the scan box, not as an error page
      parsed.ok ? queryClient.prefetchQuery(itemQueryOptions(parsed.serial)) : null,
      search.get('about') === 'lot' ? queryClient.prefetchQuery(suppliersQueryOptions()) : null,
    ]);
    return null;
  };

type Kind = ConcernAbout['kind'];

const KINDS: { value: Kind; label: string; why: string }[] = [
  { value: 'part', label: 'A part', why: 'Scan or type its serial. It goes on hold at once.' },
  {
    value: 'lot',
    label: 'A purchased lot',
    why: 'Pistons, bearings, gaskets and the like, by lot code. None of it can go into a unit until it is decided.',
  },
];

/** Two large tiles, as the severity is chosen further down, so the page reads the same way throughout. */
function AboutChoice({ value, onChange }: { value: Kind; onChange: (k: Kind) => void }) {
  const id = useId();
  return (
    <fieldset>
      <legend className="sr-only">The concern is about</legend>
      <div className="grid grid-cols-1 gap-2 md:grid-cols-2">
        {KINDS.map((k) => (
          <label
            key={k.value}
            className="flex min-h-16 cursor-pointer items-start gap-3 rounded-control border border-rule-strong bg-field px-3.5 py-3 hover:border-ink-soft has-checked:border-2 has-checked:border-accent has-checked:bg-accent-tint has-focus-visible:outline-3 has-focus-visible:outline-offset-2 has-focus-visible:outline-accent"
          >
            <input
              type="radio"
              name={`${id}-about`}
              className="mt-0.5 size-6 shrink-0 accent-accent"
              checked={value === k.value}
              onChange={() => onChange(k.value)}
              aria-labelledby={`${id}-${k.value}`}
              aria-describedby={`${id}-${k.value}-why`}
            />
            <span className="flex flex-col gap-0.5">
              <span id={`${id}-${k.value}`} className="text-lg font-semibold">
                {k.label}
              </span>
              <span id={`${id}-${k.value}-why`} className="text-[0.95rem] text-ink-soft">
                {k.why}
              </span>
            </span>
          </label>
        ))}
      </div>
    </fieldset>
  );
}

export function RaiseConcernPage() {
  const me = useSignedIn();
  const { params, setMany } = useUrlFilter();
  // a link may open the page on the lot form (?about=lot); the choice itself stays on the page, so the
  // tiles answer at once instead of after a navigation
  const [kind, setKind] = useState<Kind>(params.get('about') === 'lot' ? 'lot' : 'part');
  const parsed = parseSerial(params.get('serial') ?? '');
  const serial = kind === 'part' && parsed.ok ? parsed.serial : null;
  const item = useItem(serial);
  const [raised, setRaised] = useState<NcrDetail | null>(null);
  if (!me) return null;
  const done = raised && (kind === 'lot' ? raised.lot !== null : raised.serial === serial) ? raised : null;
  const canPhoto = me.can('attachments.upload');
  const choose = (k: Kind) => {
    setRaised(null);
    setKind(k);
  };

  return (
    // raised from the floor on a tablet as often as from a desk: the large targets either way
    <div data-density="floor" className="mx-auto max-w-[52rem]">
      <PageHeader
        title="Raise a concern"
        description="Seen something wrong with a part or a purchased lot? Say what you saw. A part goes on hold, and a lot is kept out of units, until a quality engineer decides what happens to it."
      />
      <div className="flex flex-col gap-5">
        {done ? (
          <Raised
            ncr={done}
            canRead={me.can('ncr.read')}
            canOpenLot={me.can('trail.read')}
            onAnother={() => {
              setRaised(null);
              setMany({ serial: '' });
            }}
          />
        ) : (
          <>
            <Card labelledBy="about-heading">
              <CardHeader id="about-heading" title="What the concern is about" />
              <CardBody>
                <div className="flex flex-col gap-5">
                  <AboutChoice value={kind} onChange={choose} />
                  {kind === 'part' && (
                    <div className="border-t border-rule pt-4">
                      <ScanBox
                        onItem={(i) => setMany({ serial: i.serial })}
                        preview={false}
                        autoFocus={!serial}
                        initial={params.get('serial') ?? ''}
                      />
                    </div>
                  )}
                  {kind === 'part' && item.data && (
                    <div className="border-t border-rule pt-4">
                      <ItemSummary item={item.data} />
                    </div>
                  )}
                </div>
              </CardBody>
            </Card>
            {kind === 'lot' && (
              <ConcernForm key="lot" about={{ kind: 'lot' }} canPhoto={canPhoto} onRaised={setRaised} />
            )}
            {kind === 'part' && item.error && (
              <Notice tone="bad" live="alert">
                {item.error.message}
              </Notice>
            )}
            {kind === 'part' &&
              item.data &&
              (item.data.status === 'scrapped' ? (
                <Notice tone="info" title="Already scrapped">
                  {item.data.serial} has been scrapped: there is nothing left to hold.
                </Notice>
              ) : (
                <ConcernForm
                  key={item.data.serial}
                  about={{ kind: 'part', item: item.data }}
                  canPhoto={canPhoto}
                  onRaised={setRaised}
                />
              ))}
          </>
        )}
      </div>
    </div>
  );
}
