import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { Verdict } from './package-keys';

/** POST /api/verify: whether a PDF is one of our packages, unaltered. */
export function verifyPackage(file: File) {
  const form = new FormData();
  form.set('file', file);
  return api.post<Verdict>('/verify', form);
}

export const useVerify = () => useMutation({ mutationFn: verifyPackage });
