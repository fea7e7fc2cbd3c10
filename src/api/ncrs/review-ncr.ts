import type { z } from 'zod';
import type { reviewBody } from '../../../shared/schemas/ncr';
import { useNcrStep } from './ncr-step';

/** Start reviewing a raised NCR; the server assigns it to the reviewer if nobody has it. */
export const useStartReview = (number: string) => useNcrStep<z.input<typeof reviewBody>>(number, 'review');
