import { useMutation } from '@tanstack/react-query';
import type { CaJson, CloseCaBody } from '../../../shared/schemas/corrective-action';
import { http } from '../../lib/http';
import { useAfterCa } from './after';
import { caUrl } from './ca';

export const closeCa = ({ number, body }: { number: string; body: CloseCaBody }) =>
  http<CaJson>(`${caUrl(number)}/close`, { method: 'POST', body });

export const useCloseCa = () => useMutation({ mutationFn: closeCa, onSuccess: useAfterCa() });
