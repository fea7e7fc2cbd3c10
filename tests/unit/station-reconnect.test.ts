import { describe, expect, it } from 'vitest';
import { makeQueryClient } from '../../src/lib/query-client.js';
import { stationFormQueryOptions } from '../../src/api/station/station-form.js';
import { stationsQueryOptions } from '../../src/api/reference/stations.js';
import { unitPreferencesQueryOptions } from '../../src/api/station/unit-preferences.js';

// TanStack Query refetches a stale query that is on screen when the browser says it is online again
// (onlineManager, primed in main.tsx from navigator.onLine); nothing here may switch that off
describe('the station form when a tablet comes back online', () => {
  it('when the network returns, then the queries the station form depends on are refetched (refetchOnReconnect is left on)', () => {
    const client = makeQueryClient();
    expect(client.getDefaultOptions().queries?.refetchOnReconnect).not.toBe(false);
    for (const options of [
      stationFormQueryOptions('PT-1', 'BK-7KX4-P2MK'),
      stationsQueryOptions(),
      unitPreferencesQueryOptions(),
    ]) {
      expect((options as { refetchOnReconnect?: unknown }).refetchOnReconnect).not.toBe(false);
    }
    // TanStack refetches only stale queries: the form and the stations are stale within a minute, so a
    // network back after a drop asks again (a person's own unit choices may wait their ten minutes)
    for (const options of [stationFormQueryOptions('PT-1', 'BK-7KX4-P2MK'), stationsQueryOptions()]) {
      const stale = (options as { staleTime?: unknown }).staleTime ?? client.getDefaultOptions().queries?.staleTime;
      expect(Number(stale)).toBeLessThanOrEqual(60_000);
    }
  });
});
