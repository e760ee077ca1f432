import type { HealthReport } from '@ampwright/common';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

export type Health = HealthReport;

export const healthKeys = { all: ['health'] as const };

export const getHealth = (signal?: AbortSignal) => api.get<Health>('/health', { signal, acceptStatus: [503] });

export const healthQueryOptions = () => queryOptions({ queryKey: healthKeys.all, queryFn: ({ signal }) => getHealth(signal), refetchInterval: 30_000 });

export const useHealth = () => useQuery(healthQueryOptions());
