import { onlineManager, useQueryClient } from '@tanstack/react-query';
import { lazy, Suspense, useEffect, useState, useSyncExternalStore } from 'react';
import { stationFormQueryOptions, useStationForm } from '../../api/station/station-form';
import { useTablet } from '../../api/station/tablet';
import { PageHeader } from '../../components/page-header';
import { ScanBox } from '../../components/scan-box';
import { Card, CardBody } from '../../components/ui/card';
import { Notice } from '../../components/ui/notice';
import { paths } from '../../lib/paths';
import { enterTabletMode, setTabletIdentity, subscribeTabletIdentity, tabletIdentity } from '../../lib/tablet-mode';
import { VerdictPanel, type RecordedResult } from '../station/verdict-panel';
import { QueuedPanel, WaitingResults } from '../station/waiting-results';
import type { Queued } from '../../lib/offline-queue';
import { ApiError } from '../../lib/http';
import { EnrolCard } from './enrol-card';
import { IdentifyCard } from './identify-card';

// this page is only ever a shared tablet's: every request below goes through its own routes
enterTabletMode();

const loadPartAtStation = () => import('../station/part-at-station');
const PartAtStation = lazy(() => loadPartAtStation().then((m) => ({ default: m.PartAtStation })));

/**
 * A shared tablet at one station. Nobody is signed in: the tablet reads its station's forms, and
 * each result is recorded under the person whose badge and PIN are given for it.
 */
export function TabletPage() {
  const queryClient = useQueryClient();
  const tablet = useTablet();
  const [serial, setSerial] = useState<string | null>(null);
  const who = useSyncExternalStore(subscribeTabletIdentity, tabletIdentity);
  const [result, setResult] = useState<RecordedResult | null>(null);
  const [queued, setQueued] = useState<Queued | null>(null);
  const [round, setRound] = useState(0);
  const station = tablet.data?.station ?? null;
  const form = useStationForm(station?.code ?? null, serial);
  useEffect(() => {
    if (station) void loadPartAtStation();
  }, [station]);

  if (tablet.isPending) return <p className="p-6 text-lg">Loading this tablet…</p>;
  if (!tablet.data || !station) {
    return (
      <main data-density="floor" className="mx-auto max-w-2xl p-6">
        <div className="flex flex-col gap-5">
          <Notice tone="bad" title="This device is not an enrolled station tablet">
            An administrator enrols it here, signed in on this device. People with their own sign-in use the{' '}
            <a href={paths.station}>station screen</a>.
          </Notice>
          <EnrolCard onEnrolled={() => void tablet.refetch()} />
        </div>
      </main>
    );
  }

  const identify = (w: { badge: string; pin: string }) => setTabletIdentity(w);
  const forget = () => setTabletIdentity(null);
  const recorded = (r: RecordedResult) => {
    // one identification, one result: the next reading is named afresh
    forget();
    setResult(r);
  };
  const next = () => {
    setResult(null);
    setQueued(null);
    setSerial(null);
    setRound((r) => r + 1);
  };

  return (
    <main data-density="floor" className="mx-auto flex max-w-6xl flex-col gap-5 p-4 sm:p-6">
      <PageHeader
        title={station.name}
        description={
          <span className="text-lg">
            Shared tablet “{tablet.data.label}” · records{' '}
            <span className="font-semibold text-ink">{station.stage?.name ?? '—'}</span> · {station.location} ·{' '}
            <span className="font-mono">{station.code}</span>
          </span>
        }
      />
      <WaitingResults personId={null} />
      {queued ? (
        <QueuedPanel entry={queued} onNext={next} />
      ) : result ? (
        <VerdictPanel result={result} onNext={next} canReadNcr={false} />
      ) : (
        <>
          <IdentifyCard who={who} onIdentify={identify} onClear={forget} />
          <Card labelledBy="scan-heading">
            <CardBody>
              <h2 id="scan-heading" className="mb-2 text-xl font-semibold">
                Which part
              </h2>
              <ScanBox
                key={round}
                lookup={async (printed) => {
                  if (!onlineManager.isOnline()) {
                    const cached = queryClient.getQueryData(stationFormQueryOptions(station.code, printed).queryKey);
                    if (!cached) {
                      throw new ApiError(0, {
                        code: 'network',
                        message:
                          "No network, and this part's form was not opened on this tablet before. It opens when the network is back.",
                      });
                    }
                    await loadPartAtStation();
                    return cached.item;
                  }
                  const [found] = await Promise.all([
                    queryClient.fetchQuery({ ...stationFormQueryOptions(station.code, printed), staleTime: 0 }),
                    loadPartAtStation(),
                  ]);
                  return found.item;
                }}
                onItem={(item) => setSerial(item.serial)}
                preview={false}
                hint="Scan the part's label, or type its serial and press Enter."
              />
            </CardBody>
          </Card>
          {form.error && !form.data && (
            <Notice tone="bad" live="alert" title="This part's form could not be opened">
              {form.error.message}
            </Notice>
          )}
          {form.data && serial && form.data.item.serial === serial && (
            <Suspense fallback={<p role="status">Loading the form…</p>}>
              <PartAtStation
                key={`${serial}|${round}`}
                form={form.data}
                canRecord
                canAllowReentry={false}
                canReadNcr={false}
                canRaiseConcern={false}
                onRecorded={recorded}
                onQueued={(q) => {
                  setTabletIdentity(null);
                  setQueued(q);
                }}
                onReload={() => void form.refetch()}
              />
            </Suspense>
          )}
        </>
      )}
    </main>
  );
}
