import type { z } from 'zod';
import type { assignBody } from '../../../shared/schemas/ncr';
import { useNcrStep } from './ncr-step';

/** Give an open NCR to a quality engineer, or to nobody. */
export const useAssignNcr = (number: string) => useNcrStep<z.output<typeof assignBody>>(number, 'assign');
