import { useMutation } from '@tanstack/react-query';
import type { CauseCodeBody, CauseCodeJson } from '../../../shared/schemas/warranty';
import { http } from '../../lib/http';
import { useAfterCauseCode } from './cause-codes';

export const createCauseCode = (body: CauseCodeBody) =>
  http<CauseCodeJson>('/api/warranty/cause-codes', { method: 'POST', body });

export const useCreateCauseCode = () => useMutation({ mutationFn: createCauseCode, onSuccess: useAfterCauseCode() });
