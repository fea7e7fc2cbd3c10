import { useQueryClient } from '@tanstack/react-query';
import { useEffect, useSyncExternalStore } from 'react';
import { itemKeys } from '../../api/items/keys';
import { refreshStationForms } from '../../api/station/keys';
import { Button } from '../../components/ui/button';
import { Icon } from '../../components/ui/icon';
import { Notice } from '../../components/ui/notice';
import { formatWhen, plural } from '../../lib/format';
import {
  dismissOutcome,
  queueSnapshot,
  setQueuePerson,
  startQueue,
  subscribeQueue,
  whenQueuedSent,
  type Queued,
} from '../../lib/offline-queue';

const verdictWord = (v: 'pass' | 'fail') => (v === 'pass' ? 'passed' : 'failed');

/**
 * What the tablet is holding that the server has not stored yet, in plain words, and what the
 * server said differently once it was sent. Sits at the top of the station screen, always.
 */
export function WaitingResults({ personId }: { personId: number | null }) {
  const queryClient = useQueryClient();
  const q = useSyncExternalStore(subscribeQueue, queueSnapshot);
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
              ? `${o.entry.body.serial}: the server judged it ${verdictWord(o.result.verdict)}, not ${verdictWord(o.entry.shown)}`
              : `${o.entry.body.serial}: not recorded`
          }
        >
          <p className="text-base">
            {o.kind === 'differs'
              ? `${o.entry.stageName}, taken ${formatWhen(o.entry.queuedAt)}. The rules changed while this tablet was offline; the server's verdict is the one stored${o.result.nonconformance ? `, with NCR ${o.result.nonconformance.number}` : ''}.`
              : `${o.entry.stageName}, taken ${formatWhen(o.entry.queuedAt)}. ${o.message}`}
          </p>
          <div className="mt-2">
            <Button size="lg" onClick={() => dismissOutcome(o.entry.key)}>
              Seen
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
            {plural(q.waiting.length, 'result')} waiting to be sent
          </h2>
          <p aria-live="polite" className="mt-1 text-base">
            {q.sending
              ? 'Sending now, oldest first…'
              : 'This tablet has no connection to the server. They are kept here and sent on their own, oldest first, when the network is back.'}
          </p>
          <ol className="mt-2 flex flex-col gap-1 text-base">
            {q.waiting.map((e) => (
              <li key={e.key} className="flex flex-wrap gap-x-3">
                <span className="font-mono font-semibold">{e.body.serial}</span>
                <span>{e.stageName}</span>
                <span>{formatWhen(e.queuedAt)}</span>
                <span>tablet: {verdictWord(e.shown)}</span>
                {e.person && e.person.id !== personId && <span>waits for {e.person.name} to sign in</span>}
                {e.badge && <span>badge {e.badge}</span>}
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
  return (
    <section role="status" aria-labelledby="queued-heading" className="rounded-card border-4 border-hold bg-card">
      <div className="flex flex-wrap items-center gap-x-6 gap-y-2 bg-hold-tint px-6 py-5">
        <Icon name="hold" size={48} className="text-hold" />
        <h2 id="queued-heading" className="text-4xl font-bold text-hold">
          Waiting to be sent
        </h2>
        <p className="text-xl">
          {entry.stageName}
          <span className="sr-only">,</span>
          <span className="block font-mono text-3xl font-semibold tracking-wide">{entry.body.serial}</span>
        </p>
      </div>
      <div className="flex flex-col gap-4 px-6 py-5">
        <p className="text-xl">
          No network. The tablet judged it <strong>{verdictWord(entry.shown)}</strong>; the server judges it again when
          it arrives, and this screen says so if its verdict differs.
        </p>
        <div>
          <button
            type="button"
            onClick={onNext}
            className="inline-flex h-16 min-w-56 items-center justify-center gap-2 rounded-control border border-accent-strong bg-accent px-8 text-2xl font-semibold text-white hover:bg-accent-strong"
          >
            <Icon name="scan" size={26} />
            Next part
          </button>
        </div>
      </div>
    </section>
  );
}
