import { queryOptions, useQuery } from '@tanstack/react-query';
import type { PackageSettingsDto } from '@ampwright/common';
import { api } from '../../../lib/api-client';
import { packageKeys } from './package-keys';

/** GET /api/firm/package-settings: what the firm's packages carry (the query register or not). */
export const getPackageSettings = (signal?: AbortSignal) => api.get<PackageSettingsDto>('/firm/package-settings', { signal });

export const packageSettingsQueryOptions = () => queryOptions({ queryKey: packageKeys.settings, queryFn: ({ signal }) => getPackageSettings(signal) });

export const usePackageSettings = () => useQuery(packageSettingsQueryOptions());
