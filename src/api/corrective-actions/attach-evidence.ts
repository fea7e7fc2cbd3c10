import { useMutation } from '@tanstack/react-query';
import type { CaJson, EvidenceBody } from '../../../shared/schemas/corrective-action';
import { http } from '../../lib/http';
import { useAfterCa } from './after';
import { caUrl } from './ca';

export const attachEvidence = ({ number, body }: { number: string; body: EvidenceBody }) =>
  http<CaJson>(`${caUrl(number)}/evidence`, { method: 'POST', body });

export const useAttachEvidence = () => useMutation({ mutationFn: attachEvidence, onSuccess: useAfterCa() });
