import { useMutation } from '@tanstack/react-query';
import type { RunCsvReading } from '../../../shared/domain/run-csv';
import { http } from '../../lib/http';

export type { RunCsvReading };

export type RunTestParseBody = { serial: string; csv: string };

/**
 * The test stand's export, read by the server into run-test readings. Nothing is stored: the
 * readings come back to fill the station form, and the operator records them as usual.
 */
export const parseRunTestCsv = (body: RunTestParseBody) =>
  http<{ readings: RunCsvReading[] }>('/api/run-test/parse', { method: 'POST', body });

export const useParseRunTestCsv = () => useMutation({ mutationFn: parseRunTestCsv });
