import type { QueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import type { LoaderFunctionArgs } from 'react-router';
import { parseSerial } from '../../../shared/domain/serial';
import { useSignedIn } from '../../api/auth/me';
import { stationsQueryOptions, useStations } from '../../api/reference/stations';
import { stationFormQueryOptions, useStationForm } from '../../api/station/station-form';
import { PageHeader } from '../../components/page-header';
import { ScanBox } from '../../components/scan-box';
import { Button } from '../../components/ui/button';
import { Card, CardBody } from '../../components/ui/card';
import { Notice } from '../../components/ui/notice';
import { requirePermission } from '../../lib/session';
import { useUrlFilter } from '../../lib/use-url-filter';
import { PartAtStation } from './part-at-station';
import { StationChoice } from './station-choice';
import { readTabletStation, recordingStations, useTabletStation } from './tablet-station';
import { VerdictPanel, type RecordedResult } from './verdict-panel';

export const stationLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'station.form');
    const stations = await queryClient.ensureQueryData(stationsQueryOptions());
    const code = readTabletStation();
    const parsed = parseSerial(new URL(request.url).searchParams.get('serial') ?? '');
    // a part that cannot be recorded here is said on the page, beside the scan box, not as an error page
    if (code && parsed.ok && recordingStations(stations).some((s) => s.code === code)) {
      await queryClient.prefetchQuery(stationFormQueryOptions(code, parsed.serial));
    }
    return null;
  };

export function StationPage() {
  const me = useSignedIn();
  const stations = useStations();
  const [stored, store] = useTabletStation();
  const [changing, setChanging] = useState(false);
  const { params, set } = useUrlFilter();
  // after "Next part" the old serial is ignored at once, before the address has caught up
  const [cleared, setCleared] = useState<string | null>(null);
  const inAddress = params.get('serial') ?? '';
  const raw = cleared !== null && cleared === inAddress ? '' : inAddress;
  const parsed = parseSerial(raw);
  const serial = parsed.ok ? parsed.serial : null;
  const recording = recordingStations(stations.data ?? []);
  const station = recording.find((s) => s.code === stored) ?? null;
  const stale = stored && stations.data && !station ? stored : null;
  const form = useStationForm(station?.code ?? null, serial);
  const [result, setResult] = useState<RecordedResult | null>(null);
  // each opening of a part's form is a new round, with a new idempotency key; a retry is not
  const [round, setRound] = useState(0);
  const [scanRound, setScanRound] = useState(0);
  if (!me) return null;

  const shown = result && result.serial === serial ? result : null;
  const choosing = !station || changing;

  const openAgain = () => {
    setResult(null);
    setRound((r) => r + 1);
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
        title={station && !changing ? station.name : 'Station'}
        description={
          station && !changing ? (
            <span className="text-lg">
              Records <span className="font-semibold text-ink">{station.stageName}</span> · {station.location} ·{' '}
              <span className="font-mono">{station.code}</span>
            </span>
          ) : (
            'Scan a part, record its readings and results, and see at once what is out of tolerance.'
          )
        }
        actions={
          station &&
          !changing && (
            <Button size="lg" icon="chevronRight" onClick={() => setChanging(true)}>
              Change station
            </Button>
          )
        }
      />
      {choosing ? (
        stations.error ? (
          <Notice tone="bad" live="alert" title="The stations could not be loaded">
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
      ) : shown ? (
        <VerdictPanel result={shown} onNext={nextPart} canReadNcr={me.can('ncr.read')} />
      ) : (
        <>
          <Card labelledBy="scan-heading">
            <CardBody>
              <h2 id="scan-heading" className="mb-2 text-xl font-semibold">
                Which part
              </h2>
              <ScanBox
                key={scanRound}
                onItem={(item) => {
                  setCleared(null);
                  setResult(null);
                  if (item.serial === serial) {
                    // the same part scanned again: ask the server afresh and start a new form
                    setRound((r) => r + 1);
                    void form.refetch();
                  } else set('serial', item.serial);
                }}
                preview={false}
                autoFocus={!serial}
                initial={raw}
                hint="Scan the part's label, or type its serial and press Enter."
              />
            </CardBody>
          </Card>
          {serial && form.isPending && (
            <p role="status" className="text-lg text-ink-soft">
              Loading what {station.name} records for {serial}…
            </p>
          )}
          {form.error && !form.data && (
            <Notice tone="bad" live="alert" title="This part's form could not be opened">
              {form.error.message}
            </Notice>
          )}
          {form.data && form.data.item.serial === serial && (
            <PartAtStation
              key={`${station.code}|${serial}|${round}`}
              form={form.data}
              canRecord={me.can('results.record')}
              canAllowReentry={me.can('stage.reentry')}
              canReadNcr={me.can('ncr.read')}
              canRaiseConcern={me.can('ncr.raise')}
              onRecorded={setResult}
              onReload={() => {
                openAgain();
                void form.refetch();
              }}
            />
          )}
        </>
      )}
    </div>
  );
}
