import type { QueryClient } from '@tanstack/react-query';
import { auditKeys } from '../audit/keys';
import { spcKeys } from '../spc/keys';
import { refreshStationForms } from '../station/keys';
import { specKeys } from './keys';

/**
 * A change to one rule shows in its family's book and in the rule's history, and is audited; an
 * open station form on this device is fetched again, so it judges by the version now in force.
 */
export const afterRuleChange = (queryClient: QueryClient) =>
  Promise.all([
    queryClient.invalidateQueries({ queryKey: specKeys.all }),
    queryClient.invalidateQueries({ queryKey: auditKeys.all }),
    // a rehearsal goes stale when its draft changes, and is marked kept when the draft is approved
    queryClient.invalidateQueries({ queryKey: spcKeys.all }),
    refreshStationForms(queryClient),
  ]);
