import type { z } from 'zod';
import type { closeBody } from '../../../shared/schemas/ncr';
import { useNcrStep } from './ncr-step';

/** Close a decided rework or repair once the part has passed its stage again. */
export const useCloseNcr = (number: string) => useNcrStep<z.input<typeof closeBody>>(number, 'close');
