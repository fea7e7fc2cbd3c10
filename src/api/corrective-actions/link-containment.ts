import { useMutation } from '@tanstack/react-query';
import type { CaJson, ContainmentLinkBody } from '../../../shared/schemas/corrective-action';
import { http } from '../../lib/http';
import { useAfterCa } from './after';
import { caUrl } from './ca';

export const linkContainment = ({ number, body }: { number: string; body: ContainmentLinkBody }) =>
  http<CaJson>(`${caUrl(number)}/containment`, { method: 'POST', body });

export const useLinkContainment = () => useMutation({ mutationFn: linkContainment, onSuccess: useAfterCa() });
