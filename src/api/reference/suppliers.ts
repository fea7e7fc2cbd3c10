import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Party } from '../../../shared/schemas/intake';
import { http } from '../../lib/http';
import { referenceKeys } from './keys';

export const fetchSuppliers = (signal?: AbortSignal) => http<Party[]>('/api/suppliers', { signal });

export const suppliersQueryOptions = () =>
  queryOptions({ queryKey: referenceKeys.suppliers, queryFn: ({ signal }) => fetchSuppliers(signal) });

export const useSuppliers = () => useQuery(suppliersQueryOptions());
