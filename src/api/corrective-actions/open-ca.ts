import { useMutation } from '@tanstack/react-query';
import type { CaJson, OpenCaBody } from '../../../shared/schemas/corrective-action';
import { http } from '../../lib/http';
import { useAfterCa } from './after';

export const openCa = (body: OpenCaBody) => http<CaJson>('/api/corrective-actions', { method: 'POST', body });

export const useOpenCa = () => useMutation({ mutationFn: openCa, onSuccess: useAfterCa() });
