/** The app's API as the load scripts call it: JSON in and out, a session's cookie and anti-forgery token. */

/**
 * A caller of the API at `base` (e.g. http://127.0.0.1:3000/api). `call` never throws: a request with no
 * answer (refused, reset, past `timeoutMs`) comes back with status 0 and the reason as its message.
 */
export function apiClient(base, { timeoutMs = 10000 } = {}) {
  async function call(method, path, { session, body } = {}) {
    const started = performance.now();
    try {
      const res = await fetch(`${base}${path}`, {
        method,
        headers: { 'content-type': 'application/json', 'x-ampwright-csrf': session?.csrf ?? '1', ...(session ? { cookie: session.cookie } : {}) },
        body: body ? JSON.stringify(body) : undefined,
        signal: AbortSignal.timeout(timeoutMs),
      });
      const data = await res.json().catch(() => ({}));
      return { status: res.status, data, res, ms: performance.now() - started };
    } catch (err) {
      return { status: 0, data: { message: err.message }, ms: performance.now() - started };
    }
  }
  /** The answer of a request that must succeed; anything else throws, naming the request. */
  async function json(path, { method = 'GET', body, session } = {}) {
    const r = await call(method, path, { body, session });
    if (r.status < 200 || r.status >= 300) throw new Error(`${method} ${path}: ${r.status} ${r.data.message ?? ''}`);
    return r;
  }
  /** A demo account's session. */
  async function signIn(email, password = 'Ampwright-demo-1') {
    const { data, res } = await json('/auth/login', { method: 'POST', body: { email, password } });
    return { cookie: res.headers.get('set-cookie').split(';')[0], csrf: data.csrfToken };
  }
  return { call, json, signIn };
}
