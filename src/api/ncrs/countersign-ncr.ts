import type { z } from 'zod';
import type { countersignBody } from '../../../shared/schemas/ncr';
import { useNcrStep } from './ncr-step';

/** The second quality signature a critical use-as-is needs before it takes effect. */
export const useCountersignNcr = (number: string) =>
  useNcrStep<z.output<typeof countersignBody>>(number, 'countersign');
