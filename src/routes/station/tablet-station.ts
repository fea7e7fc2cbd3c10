import { useSyncExternalStore } from 'react';
import type { Station } from '../../../shared/schemas/reference';

/** A tablet stays at one station: it remembers which, in this browser, until someone changes it. */
const KEY = 'coretrail.station';
const listeners = new Set<() => void>();
let memory: string | null = null;

export function readTabletStation(): string | null {
  try {
    return window.localStorage.getItem(KEY);
  } catch {
    // storage switched off (a locked-down browser): the tablet asks each time instead
    return null;
  }
}

function writeTabletStation(code: string) {
  try {
    window.localStorage.setItem(KEY, code);
  } catch {
    // as above; the choice then lasts until the page is closed
    memory = code;
  }
  listeners.forEach((l) => l());
}

function subscribe(onChange: () => void) {
  listeners.add(onChange);
  window.addEventListener('storage', onChange);
  return () => {
    listeners.delete(onChange);
    window.removeEventListener('storage', onChange);
  };
}

const snapshot = () => readTabletStation() ?? memory;

export function useTabletStation(): [string | null, (code: string) => void] {
  const code = useSyncExternalStore(subscribe, snapshot, () => null);
  return [code, writeTabletStation];
}

/** Stations a tablet can stand at: in service and recording a stage. */
export const recordingStations = (stations: Station[]) => stations.filter((s) => s.active && s.stageCode);
