import { useMutation } from '@tanstack/react-query';
import type { CaJson } from '../../../shared/schemas/corrective-action';
import { http } from '../../lib/http';
import { useAfterCa } from './after';
import { caUrl } from './ca';

export const completeAction = ({ number, id, note }: { number: string; id: number; note: string }) =>
  http<CaJson>(`${caUrl(number)}/actions/${id}/done`, { method: 'POST', body: { note } });

export const useCompleteAction = () => useMutation({ mutationFn: completeAction, onSuccess: useAfterCa() });
