import { useQueryClient } from '@tanstack/react-query';
import type { CaJson } from '../../../shared/schemas/corrective-action';
import { auditKeys } from '../audit/keys';
import { warrantyKeys } from '../warranty/keys';
import { caKeys } from './keys';

/** What any change to a corrective action touches: it, the lists and homes, the claims it names, the audit trail. */
export function useAfterCa() {
  const queryClient = useQueryClient();
  return (ca: CaJson) => {
    queryClient.setQueryData(caKeys.one(ca.number), ca);
    void queryClient.invalidateQueries({ queryKey: caKeys.all });
    void queryClient.invalidateQueries({ queryKey: warrantyKeys.all });
    void queryClient.invalidateQueries({ queryKey: auditKeys.all });
  };
}
