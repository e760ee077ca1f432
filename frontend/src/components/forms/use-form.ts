import { useState } from 'react';
import type { z } from 'zod';
import { ApiError } from '../../lib/api-client';

/**
 * A small form state for a zod schema: values, messages beside the fields (from the schema before
 * sending, and from the server's `details` after), and a general message for everything else.
 */
export function useForm<S extends z.ZodType<Record<string, unknown>>>(schema: S, initial: z.input<S>) {
  const [values, setValues] = useState(initial);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [formError, setFormError] = useState<string | undefined>();

  const set = <K extends keyof z.input<S>>(key: K, value: z.input<S>[K]) => {
    setValues((v) => ({ ...(v as Record<string, unknown>), [key]: value }) as z.input<S>);
    setErrors((e) => ({ ...e, [key as string]: '' }));
  };

  /** The parsed values, or undefined after showing what is wrong. */
  const validate = (): z.output<S> | undefined => {
    setFormError(undefined);
    const result = schema.safeParse(values);
    if (result.success) {
      setErrors({});
      return result.data;
    }
    const next: Record<string, string> = {};
    for (const issue of result.error.issues) next[String(issue.path[0] ?? '')] ??= issue.message;
    setErrors(next);
    return undefined;
  };

  /** Puts a failed request's messages beside their fields, or above the form. */
  const showError = (err: unknown) => {
    if (err instanceof ApiError && err.details.some((d) => d.field)) {
      const next: Record<string, string> = {};
      for (const d of err.details) if (d.field) next[d.field] ??= d.message;
      setErrors(next);
      setFormError(err.details.some((d) => !d.field) ? err.message : undefined);
    } else {
      setFormError(err instanceof Error ? err.message : 'Something went wrong.');
    }
  };

  return { values, set, errors, formError, validate, showError };
}
