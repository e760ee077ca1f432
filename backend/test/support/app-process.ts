/** The built app (dist/main.js) as a separate process on a port of its own, against the test database. */
import { spawn, type ChildProcess } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';

export function startApp(port: number, options: { worker?: boolean; env?: Record<string, string>; output?: 'ignore' | 'pipe' } = {}): ChildProcess {
  return spawn(process.execPath, [join(__dirname, '..', '..', 'dist', 'main.js')], {
    env: { ...process.env, APP_PORT: String(port), STATIC_DIR: '', LOG_REQUESTS: 'false', PACKAGE_WORKER: options.worker ? 'true' : 'false', ...options.env },
    stdio: options.output ?? 'ignore',
  });
}

/** Waits until the app at `base` answers its health check. */
export async function ready(base: string): Promise<void> {
  const until = Date.now() + 60_000;
  while (Date.now() < until) {
    try {
      if ((await fetch(`${base}/api/health`)).ok) return;
    } catch {
      /* not up yet */
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error('the app did not start');
}

/** A process's resident memory in MB (Linux's /proc). */
export function residentMb(pid: number): number {
  const line = readFileSync(`/proc/${pid}/status`, 'utf8')
    .split('\n')
    .find((l) => l.startsWith('VmRSS:'));
  return Number(/(\d+)/.exec(line ?? '')?.[1] ?? NaN) / 1024;
}
