import type { DispositionBody } from '../../../shared/schemas/ncr';
import { useNcrStep } from './ncr-step';

/** The disposition, signed with the decider's password (a wrong one is a 400 signature_refused). */
export const useDecideNcr = (number: string) => useNcrStep<DispositionBody>(number, 'disposition');
