import { useWatch } from 'react-hook-form';
import type { EngineFamily } from '../../../shared/schemas/reference';
import { useFamilies } from '../../api/reference/families';

/** The family chosen on the build sheet, once the families have loaded. */
export function useChosenFamily(): EngineFamily | undefined {
  const families = useFamilies();
  const code = useWatch({ name: 'family' }) as string | undefined;
  return families.data?.find((f) => f.code === code);
}
