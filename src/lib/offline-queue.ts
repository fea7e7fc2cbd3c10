import { createStore, del, entries, set } from 'idb-keyval';
import type { RecordResultBody } from '../api/station/record-result';
import type { ResultJson } from '../api/station/types';
import { ApiError, http } from './http';

/**
 * Results recorded while the station had no network: kept on the tablet, each with the
 * idempotency key its form was opened with, and sent one at a time in the order they were taken
 * once the network is back. The server judges each again on arrival; where its verdict is not the
 * one the tablet showed (a rule approved meanwhile), the operator is told.
 *
 * A signed-in person's results are kept in IndexedDB and survive a reload. A shared tablet's carry
 * the badge and PIN of whoever took them: those are kept in this page's memory only, never written
 * to the device, so a reload of a shared tablet loses what it was holding (the screen says so).
 */
export type Queued = {
  /** The idempotency key: a result sent twice is stored once. */
  key: string;
  /** When it was taken, for the order of sending. */
  queuedAt: string;
  path: '/api/results' | '/api/tablet/results';
  body: RecordResultBody;
  stageName: string;
  /** What the tablet judged from its own copy of the rules. */
  shown: 'pass' | 'fail';
  /** The badge it was taken under, on a shared tablet. */
  badge?: string;
  /** The signed-in person it was taken under (not on a shared tablet): sent only under their session. */
  person?: { id: number; name: string };
};

/** What became of a queued result once the server answered. */
export type Outcome =
  { kind: 'differs'; entry: Queued; result: ResultJson } | { kind: 'refused'; entry: Queued; message: string };

type State = { waiting: Queued[]; sending: boolean; sent: number; outcomes: Outcome[]; ready: boolean };

let state: State = { waiting: [], sending: false, sent: 0, outcomes: [], ready: false };
const listeners = new Set<() => void>();
const pins = new Map<string, string>();
let store: ReturnType<typeof createStore> | null = null;
let signedIn: number | null = null;

/** Who is signed in in this browser now: another person's waiting results are never sent under it. */
export const setQueuePerson = (id: number | null) => {
  signedIn = id;
};

const update = (change: Partial<State>) => {
  state = { ...state, ...change };
  listeners.forEach((l) => l());
};

function db() {
  store ??= createStore('coretrail-station', 'waiting');
  return store;
}

const byTime = (a: Queued, b: Queued) => a.queuedAt.localeCompare(b.queuedAt);

export const queueSnapshot = () => state;
export function subscribeQueue(onChange: () => void) {
  listeners.add(onChange);
  return () => listeners.delete(onChange);
}

/** Results already waiting go first: a new one joins the queue so the order of taking is kept. */
export const mustQueue = () => state.waiting.length > 0 || (typeof navigator !== 'undefined' && !navigator.onLine);

/** A result that could not be sent now; its PIN (shared tablet) stays in memory only. */
export async function enqueue(entry: Queued, pin?: string): Promise<void> {
  if (pin) pins.set(entry.key, pin);
  else await set(entry.key, entry, db()).catch(() => undefined);
  update({ waiting: [...state.waiting.filter((q) => q.key !== entry.key), entry].sort(byTime) });
}

export const dismissOutcome = (key: string) => update({ outcomes: state.outcomes.filter((o) => o.entry.key !== key) });

async function drop(entry: Queued) {
  pins.delete(entry.key);
  await del(entry.key, db()).catch(() => undefined);
  update({ waiting: state.waiting.filter((q) => q.key !== entry.key) });
}

let onSent: ((result: ResultJson) => void) | null = null;
/** The page's cache refresh after a queued result is stored (forms, item views). */
export const whenQueuedSent = (fn: (result: ResultJson) => void) => {
  onSent = fn;
};

/**
 * Sends what is waiting, oldest first, one at a time; stops at the first result that cannot reach
 * the server, to try again later. A refusal (a 4xx) is final for that result: it leaves the queue
 * and is shown to the operator, and the rest go on.
 */
export async function flushQueue(): Promise<void> {
  if (state.sending || !state.waiting.length) return;
  update({ sending: true });
  try {
    while (state.waiting.length) {
      // a result waits for its own person's session: never recorded under whoever is signed in now
      const entry = state.waiting.find((q) => !q.person || q.person.id === signedIn);
      if (!entry) return;
      const pin = pins.get(entry.key);
      if (entry.badge && !pin) {
        // a shared tablet's result from before a reload: its PIN is gone, it cannot be sent
        update({ outcomes: [...state.outcomes, { kind: 'refused', entry, message: lostPin }] });
        await drop(entry);
        continue;
      }
      const body = entry.badge ? { ...entry.body, badge: entry.badge, pin } : entry.body;
      try {
        const result = await http<ResultJson>(entry.path, { method: 'POST', body });
        await drop(entry);
        update({
          sent: state.sent + 1,
          outcomes:
            result.verdict === entry.shown ? state.outcomes : [...state.outcomes, { kind: 'differs', entry, result }],
        });
        onSent?.(result);
      } catch (err) {
        if (
          err instanceof ApiError &&
          err.status >= 400 &&
          err.status < 500 &&
          err.status !== 408 &&
          err.status !== 429
        ) {
          await drop(entry);
          update({ outcomes: [...state.outcomes, { kind: 'refused', entry, message: err.message }] });
          continue;
        }
        return;
      }
    }
  } finally {
    update({ sending: false });
  }
}

const lostPin =
  'This shared tablet was reloaded before the network came back, and PINs are never kept on the device. Nothing was recorded: take the reading again.';

let started = false;
/** Once per page: what a signed-in person left waiting, and sending whenever the network returns. */
export function startQueue(): void {
  if (started || typeof window === 'undefined') return;
  started = true;
  window.addEventListener('online', () => void flushQueue());
  // navigator.onLine can say online behind a dead access point: look again now and then
  window.setInterval(() => {
    if (state.waiting.length && navigator.onLine) void flushQueue();
  }, 15_000);
  void entries<string, Queued>(db())
    .then((rows) => {
      const kept = rows.map(([, v]) => v).filter((v) => !state.waiting.some((q) => q.key === v.key));
      update({ waiting: [...state.waiting, ...kept].sort(byTime), ready: true });
      if (navigator.onLine) void flushQueue();
    })
    .catch(() => update({ ready: true }));
}
