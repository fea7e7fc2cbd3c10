import { useMutation } from '@tanstack/react-query';
import type { CaJson, AddSourceBody } from '../../../shared/schemas/corrective-action';
import { http } from '../../lib/http';
import { useAfterCa } from './after';
import { caUrl } from './ca';

export const addSource = ({ number, body }: { number: string; body: AddSourceBody }) =>
  http<CaJson>(`${caUrl(number)}/sources`, { method: 'POST', body });

export const useAddSource = () => useMutation({ mutationFn: addSource, onSuccess: useAfterCa() });
