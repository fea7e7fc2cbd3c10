import { onlineManager, useQueryClient, type QueryClient } from '@tanstack/react-query';
import { lazy, Suspense, useEffect, useState } from 'react';
import { useLocation, type LoaderFunctionArgs } from 'react-router';
import { parseSerial } from '../../../shared/domain/serial';
import { useSignedIn } from '../../api/auth/me';
import { stationsQueryOptions, useStations } from '../../api/reference/stations';
import { stationFormQueryOptions, useStationForm } from '../../api/station/station-form';
import { unitPreferencesQueryOptions } from '../../api/station/unit-preferences';
import { PageHeader } from '../../components/page-header';
import { ScanBox } from '../../components/scan-box';
import { Button } from '../../components/ui/button';
import { Card, CardBody } from '../../components/ui/card';
import { Notice } from '../../components/ui/notice';
import { ApiError } from '../../lib/http';
import { requirePermission } from '../../lib/session';
import { t as translate, useT } from '../../lib/i18n';
import { useUrlFilter } from '../../lib/use-url-filter';
import { StationChoice } from './station-choice';
import { readTabletStation, recordingStations, useTabletStation } from './tablet-station';
import { VerdictPanel, type RecordedResult } from './verdict-panel';
import { QueuedPanel, WaitingResults } from './waiting-results';
import type { Queued } from '../../lib/offline-queue';

// The part's form (react-hook-form, decimal.js, the evaluator) is not needed to show the screen and
// wait for a scan, so it is not part of the first load; a scan (or a loader) waits for it only if it
// has not arrived yet.
const loadPartAtStation = () => import('./part-at-station');
const PartAtStation = lazy(() => loadPartAtStation().then((m) => ({ default: m.PartAtStation })));

export const stationLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'station.form');
    const stations = await queryClient.ensureQueryData(stationsQueryOptions());
    const code = readTabletStation();
    const parsed = parseSerial(new URL(request.url).searchParams.get('serial') ?? '');
    // the units this person types in, there before the first scan opens a form
    void queryClient.prefetchQuery(unitPreferencesQueryOptions());
    // a part that cannot be recorded here is said on the page, beside the scan box, not as an error page
    // with no network a cached form is shown as it is (asking would wait for the network to return)
    if (code && parsed.ok && onlineManager.isOnline() && recordingStations(stations).some((s) => s.code === code)) {
      await Promise.all([queryClient.prefetchQuery(stationFormQueryOptions(code, parsed.serial)), loadPartAtStation()]);
    }
    return null;
  };

export function StationPage() {
  const me = useSignedIn();
  const t = useT();
  const queryClient = useQueryClient();
  const stations = useStations();
  const [stored, store] = useTabletStation();
  const [changing, setChanging] = useState(false);
  const { params, set } = useUrlFilter();
  // after "Next part" the old serial is ignored at once, before the address has caught up
  const [cleared, setCleared] = useState<string | null>(null);
  const inAddress = params.get('serial') ?? '';
  // A part just scanned shows at once, from the form its scan fetched, while the address catches
  // up; only until the next navigation lands, whether that is the serial's or another the operator made.
  const location = useLocation();
  const [scanned, setScanned] = useState<{ serial: string; at: string } | null>(null);
  const quick = scanned && scanned.at === location.key ? scanned.serial : null;
  const raw = quick ?? (cleared !== null && cleared === inAddress ? '' : inAddress);
  const parsed = parseSerial(raw);
  const serial = parsed.ok ? parsed.serial : null;
  const recording = recordingStations(stations.data ?? []);
  const station = recording.find((s) => s.code === stored) ?? null;
  const stale = stored && stations.data && !station ? stored : null;
  const form = useStationForm(station?.code ?? null, serial);
  const [result, setResult] = useState<RecordedResult | null>(null);
  const [queued, setQueued] = useState<Queued | null>(null);
  // each opening of a part's form is a new round, with a new idempotency key; a retry is not
  const [round, setRound] = useState(0);
  const [scanRound, setScanRound] = useState(0);
  // asked for once the screen is up (never before its first paint), so no scan waits for it either
  const code = station?.code;
  useEffect(() => {
    if (code) void loadPartAtStation();
  }, [code]);
  if (!me) return null;

  const shown = result && result.serial === serial ? result : null;
  const choosing = !station || changing;

  const openAgain = () => {
    setResult(null);
    setQueued(null);
    setRound((r) => r + 1);
  };
  // A scan asks for the part's form straight away: it names the item too (and is a 404 for an
  // unknown serial), so the scan box needs no item lookup of its own first. Always afresh: whether
  // the part is due here may have changed since the form was last asked for.
  const lookForm = async (code: string, printed: string) => {
    // no network: a form this tablet has already opened is good enough to record on; the server judges on arrival
    if (!onlineManager.isOnline()) {
      const cached = queryClient.getQueryData(stationFormQueryOptions(code, printed).queryKey);
      if (!cached) throw new ApiError(0, { code: 'network', message: translate('station.offlineUnknown') });
      await loadPartAtStation();
      return cached.item;
    }
    try {
      const [found] = await Promise.all([
        queryClient.fetchQuery({ ...stationFormQueryOptions(code, printed), staleTime: 0 }),
        loadPartAtStation(),
      ]);
      return found.item;
    } catch (err) {
      // the form's 404 is the serial's, unless this station has gone meanwhile: then the screen offers the choice again
      if (err instanceof ApiError && err.status === 404)
        void queryClient.invalidateQueries({ queryKey: stationsQueryOptions().queryKey });
      throw err;
    }
  };

  const nextPart = () => {
    openAgain();
    setCleared(inAddress);
    set('serial', '');
    setScanRound((r) => r + 1);
  };

  return (
    <div data-density="floor" className="flex flex-col gap-5">
      <PageHeader
        title={station && !changing ? station.name : t('station.title')}
        description={
          station && !changing ? (
            <span className="text-lg">
              {t('station.records')} <span className="font-semibold text-ink">{station.stageName}</span> ·{' '}
              {station.location} · <span className="font-mono">{station.code}</span>
            </span>
          ) : (
            t('station.intro')
          )
        }
        actions={
          station &&
          !changing && (
            <Button size="lg" icon="chevronRight" onClick={() => setChanging(true)}>
              {t('station.change')}
            </Button>
          )
        }
      />
      <WaitingResults personId={me.user.id} />
      {choosing ? (
        stations.error ? (
          <Notice tone="bad" live="alert" title={t('station.stationsFailed')}>
            {stations.error.message}
          </Notice>
        ) : (
          <StationChoice
            stations={recording}
            current={station}
            stale={stale}
            onChoose={(code) => {
              store(code);
              setChanging(false);
              openAgain();
            }}
            onCancel={station ? () => setChanging(false) : undefined}
          />
        )
      ) : queued && queued.body.serial === serial ? (
        <QueuedPanel entry={queued} onNext={nextPart} />
      ) : shown ? (
        <VerdictPanel result={shown} onNext={nextPart} canReadNcr={me.can('ncr.read')} />
      ) : (
        <>
          <Card labelledBy="scan-heading">
            <CardBody>
              <h2 id="scan-heading" className="mb-2 text-xl font-semibold">
                {t('station.whichPart')}
              </h2>
              <ScanBox
                key={scanRound}
                lookup={(printed) => lookForm(station.code, printed)}
                onItem={(item) => {
                  setCleared(null);
                  setResult(null);
                  // the same part scanned again: its form was just asked afresh; start a new round of it
                  if (item.serial === serial) setRound((r) => r + 1);
                  else {
                    setScanned({ serial: item.serial, at: location.key });
                    set('serial', item.serial);
                  }
                }}
                preview={false}
                autoFocus={!serial}
                initial={raw}
                hint={t('station.scanHint')}
              />
            </CardBody>
          </Card>
          {serial && form.isPending && <LoadingPart station={station.name} serial={serial} />}
          {form.error && !form.data && (
            <Notice tone="bad" live="alert" title={t('station.formFailed')}>
              {form.error.message}
            </Notice>
          )}
          {form.data && form.data.item.serial === serial && (
            <Suspense fallback={<LoadingPart station={station.name} serial={serial} />}>
              <PartAtStation
                key={`${station.code}|${serial}|${round}`}
                form={form.data}
                canRecord={me.can('results.record')}
                canAllowReentry={me.can('stage.reentry')}
                canReadNcr={me.can('ncr.read')}
                canRaiseConcern={me.can('ncr.raise')}
                onRecorded={setResult}
                onQueued={setQueued}
                onReload={() => {
                  openAgain();
                  void form.refetch();
                }}
              />
            </Suspense>
          )}
        </>
      )}
    </div>
  );
}

function LoadingPart({ station, serial }: { station: string; serial: string }) {
  const t = useT();
  return (
    <p role="status" className="text-lg text-ink-soft">
      {t('station.loadingPart', { station, serial })}
    </p>
  );
}
