import { useMutation } from '@tanstack/react-query';
import type { CaJson, VerifyBody } from '../../../shared/schemas/corrective-action';
import { http } from '../../lib/http';
import { useAfterCa } from './after';
import { caUrl } from './ca';

export const verifyCa = ({ number, body }: { number: string; body: VerifyBody }) =>
  http<CaJson>(`${caUrl(number)}/verify`, { method: 'POST', body });

export const useVerifyCa = () => useMutation({ mutationFn: verifyCa, onSuccess: useAfterCa() });
