import { useQueryClient } from '@tanstack/react-query';
import { useEffect, useSyncExternalStore } from 'react';
import { itemKeys } from '../../api/items/keys';
import { refreshStationForms } from '../../api/station/keys';
import { Button } from '../../components/ui/button';
import { Icon } from '../../components/ui/icon';
import { Notice } from '../../components/ui/notice';
import { formatMoment, useT } from '../../lib/i18n';
import {
  dismissOutcome,
  queueSnapshot,
  setQueuePerson,
  startQueue,
  subscribeQueue,
  whenQueuedSent,
  type Queued,
} from '../../lib/offline-queue';
import { positionLabel } from '../../lib/position-words';

const verdictKey = (v: 'pass' | 'fail') => (v === 'pass' ? 'waiting.passed' : 'waiting.failed');

/**
 * What the tablet is holding that the server has not stored yet, in plain words, and what the
 * server said differently once it was sent. Sits at the top of the station screen, always.
 */
export function WaitingResults({ personId }: { personId: number | null }) {
  const queryClient = useQueryClient();
  const q = useSyncExternalStore(subscribeQueue, queueSnapshot);
  const t = useT();
  useEffect(() => {
    setQueuePerson(personId);
    whenQueuedSent((result) => {
      void refreshStationForms(queryClient);
      void queryClient.invalidateQueries({ queryKey: itemKeys.one(result.serial) });
    });
    startQueue();
  }, [personId, queryClient]);

  return (
    <>
      {q.outcomes.map((o) => (
        <Notice
          key={o.entry.key}
          tone="bad"
          live="alert"
          title={
            o.kind === 'differs'
              ? t('waiting.differs', {
                  serial: o.entry.body.serial,
                  server: t(verdictKey(o.result.verdict)),
                  tablet: t(verdictKey(o.entry.shown)),
                })
              : t('waiting.refused', { serial: o.entry.body.serial })
          }
        >
          <p className="text-base">
            {o.kind === 'differs'
              ? t('waiting.differsWhy', { stage: o.entry.stageName, when: formatMoment(o.entry.queuedAt) })
              : t('waiting.refusedWhy', {
                  stage: o.entry.stageName,
                  when: formatMoment(o.entry.queuedAt),
                  message: o.message,
                })}
            {o.kind === 'differs' && o.result.nonconformance && ` NCR ${o.result.nonconformance.number}.`}
          </p>
          {o.kind === 'differs' && o.result.failing.length > 0 && (
            <ul className="mt-1 list-disc pl-5 text-base font-semibold">
              {o.result.failing.slice(0, 4).map((r) => (
                <li key={`${r.characteristic}@${r.position}`}>
                  {r.name}, {positionLabel(r.position, r.positionLabel)}: {r.reason}
                </li>
              ))}
            </ul>
          )}
          <div className="mt-2">
            <Button size="lg" onClick={() => dismissOutcome(o.entry.key)}>
              {t('waiting.seen')}
            </Button>
          </div>
        </Notice>
      ))}
      {q.waiting.length > 0 && (
        <section
          aria-labelledby="waiting-heading"
          className="rounded-card border-2 border-hold bg-hold-tint px-5 py-4 text-ink"
        >
          <h2 id="waiting-heading" className="flex items-center gap-2 text-xl font-semibold text-hold">
            <Icon name="hold" size={24} />
            {t('waiting.heading', { count: q.waiting.length })}
          </h2>
          <p aria-live="polite" className="mt-1 text-base">
            {q.sending ? t('waiting.sending') : t('waiting.offline')}
          </p>
          <ol className="mt-2 flex flex-col gap-1 text-base">
            {q.waiting.map((e) => (
              <li key={e.key} className="flex flex-wrap gap-x-3">
                <span className="font-mono font-semibold">{e.body.serial}</span>
                <span>{e.stageName}</span>
                <span>{formatMoment(e.queuedAt)}</span>
                <span>{t('waiting.tablet', { verdict: t(verdictKey(e.shown)) })}</span>
                {e.person && e.person.id !== personId && <span>{t('waiting.waitsFor', { name: e.person.name })}</span>}
                {e.badge && <span>{t('waiting.badge', { badge: e.badge })}</span>}
              </li>
            ))}
          </ol>
        </section>
      )}
    </>
  );
}

/** In place of the verdict: the result is on the tablet, not yet on the server. */
export function QueuedPanel({ entry, onNext }: { entry: Queued; onNext: () => void }) {
  const t = useT();
  return (
    <section role="status" aria-labelledby="queued-heading" className="rounded-card border-4 border-hold bg-card">
      <div className="flex flex-wrap items-center gap-x-6 gap-y-2 bg-hold-tint px-6 py-5">
        <Icon name="hold" size={48} className="text-hold" />
        <h2 id="queued-heading" className="text-4xl font-bold text-hold">
          {t('queued.heading')}
        </h2>
        <p className="text-xl">
          {entry.stageName}
          <span className="sr-only">,</span>
          <span className="block font-mono text-3xl font-semibold tracking-wide">{entry.body.serial}</span>
        </p>
      </div>
      <div className="flex flex-col gap-4 px-6 py-5">
        <p className="text-xl">{t('queued.body', { verdict: t(verdictKey(entry.shown)) })}</p>
        <div>
          <button
            type="button"
            onClick={onNext}
            className="inline-flex h-16 min-w-56 items-center justify-center gap-2 rounded-control border border-accent-strong bg-accent px-8 text-2xl font-semibold text-white hover:bg-accent-strong"
          >
            <Icon name="scan" size={26} />
            {t('verdict.nextPart')}
          </button>
        </div>
      </div>
    </section>
  );
}
