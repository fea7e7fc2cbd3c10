import { useMutation } from '@tanstack/react-query';
import type { CaJson, TaskBody } from '../../../shared/schemas/corrective-action';
import { http } from '../../lib/http';
import { useAfterCa } from './after';
import { caUrl } from './ca';

export const addAction = ({ number, body }: { number: string; body: TaskBody }) =>
  http<CaJson>(`${caUrl(number)}/actions`, { method: 'POST', body });

export const useAddAction = () => useMutation({ mutationFn: addAction, onSuccess: useAfterCa() });
