import { useMutation } from '@tanstack/react-query';
import type { CauseCodeJson } from '../../../shared/schemas/warranty';
import { http } from '../../lib/http';
import { useAfterCauseCode } from './cause-codes';

export const updateCauseCode = ({
  code,
  body,
}: {
  code: string;
  body: { description?: string; countsAsFailure?: boolean; active?: boolean };
}) => http<CauseCodeJson>(`/api/warranty/cause-codes/${encodeURIComponent(code)}`, { method: 'PATCH', body });

export const useUpdateCauseCode = () => useMutation({ mutationFn: updateCauseCode, onSuccess: useAfterCauseCode() });
