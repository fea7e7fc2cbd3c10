import type { z } from 'zod';
import type { voidBody } from '../../../shared/schemas/ncr';
import { useNcrStep } from './ncr-step';

/** Void an NCR raised in error; the part is released if nothing else holds it. */
export const useVoidNcr = (number: string) => useNcrStep<z.output<typeof voidBody>>(number, 'void');
