import { useMutation } from '@tanstack/react-query';
import type { CaJson, UpdateCaBody } from '../../../shared/schemas/corrective-action';
import { http } from '../../lib/http';
import { useAfterCa } from './after';
import { caUrl } from './ca';

export const updateCa = ({ number, body }: { number: string; body: UpdateCaBody }) =>
  http<CaJson>(`${caUrl(number)}`, { method: 'PATCH', body });

export const useUpdateCa = () => useMutation({ mutationFn: updateCa, onSuccess: useAfterCa() });
