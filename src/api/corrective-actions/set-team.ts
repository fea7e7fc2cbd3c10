import { useMutation } from '@tanstack/react-query';
import type { CaJson, TeamBody } from '../../../shared/schemas/corrective-action';
import { http } from '../../lib/http';
import { useAfterCa } from './after';
import { caUrl } from './ca';

export const setTeam = ({ number, body }: { number: string; body: TeamBody }) =>
  http<CaJson>(`${caUrl(number)}/team`, { method: 'PUT', body });

export const useSetTeam = () => useMutation({ mutationFn: setTeam, onSuccess: useAfterCa() });
