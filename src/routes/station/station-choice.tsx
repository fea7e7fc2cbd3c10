import { useId } from 'react';
import type { Station } from '../../../shared/schemas/reference';
import { useStationQueues, type StationQueue } from '../../api/station/station-queues';
import { Button } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Icon } from '../../components/ui/icon';
import { Notice } from '../../components/ui/notice';
import { t, useT } from '../../lib/i18n';

type StationChoiceProps = {
  stations: Station[];
  current: Station | null;
  /** A code stored on this tablet that is no longer a recording station. */
  stale: string | null;
  onChoose: (code: string) => void;
  onCancel?: () => void;
};

/**
 * Stations by the area they stand in, each area and each station in route order (where the part
 * goes first comes first), so the one beside the tablet is found by walking the line in one's head.
 * Without the counts (still coming, or refused) the tiles keep the same areas in name order.
 */
export function areasInRouteOrder(stations: Station[], queues: StationQueue[] | undefined) {
  const rank = new Map(queues?.map((q) => [q.code, q.rank]));
  const sorted = [...stations].sort(
    (a, b) => (rank.get(a.code) ?? 1e9) - (rank.get(b.code) ?? 1e9) || a.name.localeCompare(b.name),
  );
  const areas = new Map<string, Station[]>();
  for (const s of sorted) {
    const k = s.location || t('chooser.elsewhere');
    areas.set(k, [...(areas.get(k) ?? []), s]);
  }
  return [...areas.entries()];
}

export function StationChoice({ stations, current, stale, onChoose, onCancel }: StationChoiceProps) {
  const id = useId();
  const t = useT();
  const queues = useStationQueues();
  const waiting = new Map(queues.data?.map((q) => [q.code, q.waiting]));
  return (
    <Card labelledBy={`${id}-title`}>
      <CardHeader
        id={`${id}-title`}
        title={t('chooser.title')}
        description={t('chooser.intro')}
        actions={
          onCancel &&
          current && (
            <Button size="lg" onClick={onCancel}>
              {t('chooser.keep', { station: current.name })}
            </Button>
          )
        }
      />
      <CardBody>
        <div className="flex flex-col gap-6">
          {stale && (
            <Notice tone="hold" title={t('chooser.staleTitle', { code: stale })}>
              {t('chooser.staleBody')}
            </Notice>
          )}
          {areasInRouteOrder(stations, queues.data).map(([area, group]) => (
            <section key={area} aria-labelledby={`${id}-${area}`}>
              <h3 id={`${id}-${area}`} className="mb-2 text-lg font-semibold text-ink-soft">
                {area}
              </h3>
              <ul className="grid grid-cols-1 gap-3 sm:grid-cols-2 lg:grid-cols-3">
                {group.map((s) => {
                  const n = waiting.get(s.code);
                  const here = current?.code === s.code;
                  return (
                    <li key={s.code}>
                      <button
                        type="button"
                        aria-pressed={here}
                        onClick={() => onChoose(s.code)}
                        className={`flex min-h-24 w-full flex-col items-start justify-between gap-2 rounded-card border-2 bg-card p-4 text-left hover:border-accent focus-visible:outline-3 focus-visible:outline-accent ${here ? 'border-accent bg-accent-tint' : 'border-rule-strong'}`}
                      >
                        <span className="flex w-full items-start justify-between gap-2">
                          <span className="text-xl font-semibold leading-tight text-ink">{s.name}</span>
                          {here && (
                            <Icon name="ok" size={22} className="shrink-0 text-accent" label={t('chooser.chosen')} />
                          )}
                        </span>
                        <span className="text-base text-ink-soft">{s.stageName}</span>
                        <span className="flex w-full items-center justify-between gap-2">
                          <span className="font-mono text-base text-ink">{s.code}</span>
                          <span className="text-base font-medium text-ink">
                            {n === undefined ? '' : t('chooser.waiting', { count: n })}
                          </span>
                        </span>
                      </button>
                    </li>
                  );
                })}
              </ul>
            </section>
          ))}
        </div>
      </CardBody>
    </Card>
  );
}
