import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Party } from '../../../shared/schemas/intake';
import { http } from '../../lib/http';
import { referenceKeys } from './keys';

export const fetchCustomers = (signal?: AbortSignal) => http<Party[]>('/api/customers', { signal });

export const customersQueryOptions = () =>
  queryOptions({ queryKey: referenceKeys.customers, queryFn: ({ signal }) => fetchCustomers(signal) });

export const useCustomers = () => useQuery(customersQueryOptions());
