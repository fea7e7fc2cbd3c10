import type { z } from 'zod';
import type { containmentBody } from '../../../shared/schemas/ncr';
import { useNcrStep } from './ncr-step';

/** What was done to keep the part from going on, recorded while the NCR is open. */
export const useUpdateContainment = (number: string) =>
  useNcrStep<z.output<typeof containmentBody>>(number, 'containment');
