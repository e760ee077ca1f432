import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { PackageSettingsDto } from '@ampwright/common';
import { api } from '../../../lib/api-client';
import { packageKeys } from './package-keys';

/** PUT /api/firm/package-settings. */
export const setPackageSettings = (body: PackageSettingsDto) => api.put<PackageSettingsDto>('/firm/package-settings', body);

export function useSetPackageSettings() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: setPackageSettings, onSuccess: (settings) => queryClient.setQueryData(packageKeys.settings, settings) });
}
