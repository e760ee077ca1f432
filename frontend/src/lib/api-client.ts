/**
 * The one way the app talks to /api: same-origin cookies, JSON in and out, and errors typed after the
 * server's single error shape. It neither redirects nor shows messages: that is React's job.
 */
export interface ApiErrorDetail {
  field?: string;
  message: string;
}

export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details: ApiErrorDetail[] = [],
    readonly body?: unknown,
  ) {
    super(message);
    this.name = 'ApiError';
  }
}

type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';

/** The session's anti-forgery token (from sign-in or /auth/me), sent with every state-changing request. */
let csrfToken: string | undefined;
export const setCsrfToken = (token: string | undefined) => {
  csrfToken = token;
};
export const CSRF_HEADER = 'x-ampwright-csrf';
export const csrfHeaderValue = () => csrfToken ?? '1';

export interface RequestOptions {
  body?: unknown;
  signal?: AbortSignal;
  /** Statuses to return as data rather than throw (e.g. 503 from /api/health). */
  acceptStatus?: number[];
}

export async function apiRequest<T>(method: Method, path: string, options: RequestOptions = {}): Promise<T> {
  const isForm = typeof FormData !== 'undefined' && options.body instanceof FormData;
  let response: Response;
  try {
    response = await fetch(`/api${path}`, {
      method,
      credentials: 'same-origin',
      headers: {
        Accept: 'application/json',
        ...(options.body !== undefined && !isForm ? { 'Content-Type': 'application/json' } : {}),
        ...(method !== 'GET' ? { [CSRF_HEADER]: csrfHeaderValue() } : {}),
      },
      body: options.body === undefined ? undefined : isForm ? (options.body as FormData) : JSON.stringify(options.body),
      signal: options.signal,
    });
  } catch (err) {
    if ((err as Error).name === 'AbortError') throw err;
    throw new ApiError(0, 'NETWORK', 'The server could not be reached. Check your connection and try again.');
  }
  const text = await response.text();
  let data: unknown = undefined;
  if (text) {
    try {
      data = JSON.parse(text);
    } catch {
      data = text;
    }
  }
  if (response.ok || options.acceptStatus?.includes(response.status)) return data as T;
  const body = (data ?? {}) as { code?: string; message?: string; details?: ApiErrorDetail[] };
  throw new ApiError(response.status, body.code ?? 'HTTP_ERROR', body.message ?? `The server answered ${response.status}.`, body.details ?? [], data);
}

export const api = {
  get: <T>(path: string, options?: RequestOptions) => apiRequest<T>('GET', path, options),
  post: <T>(path: string, body?: unknown, options?: RequestOptions) => apiRequest<T>('POST', path, { ...options, body }),
  put: <T>(path: string, body?: unknown, options?: RequestOptions) => apiRequest<T>('PUT', path, { ...options, body }),
  patch: <T>(path: string, body?: unknown, options?: RequestOptions) => apiRequest<T>('PATCH', path, { ...options, body }),
  delete: <T>(path: string, options?: RequestOptions) => apiRequest<T>('DELETE', path, options),
};
