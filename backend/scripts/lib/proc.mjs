// Small process helpers for the lifecycle scripts: run a command, keep track of what we started,
// stop all of it on exit or on Ctrl-C, and fail with a message that tells the user what to do.
import { spawn, spawnSync } from 'node:child_process';
import { createConnection } from 'node:net';

export class SetupError extends Error {}

export function log(message) {
  process.stderr.write(`[ampwright] ${message}\n`);
}

/** Runs a command to completion with inherited output; throws a SetupError when it fails. */
export function run(command, args, options = {}) {
  const result = spawnSync(command, args, { stdio: 'inherit', ...options });
  if (result.error) throw new SetupError(`${command} could not be run: ${result.error.message}`);
  if (result.status !== 0) throw new SetupError(options.failure ?? `${command} ${args.join(' ')} failed (exit ${result.status})`);
  return result;
}

export function commandExists(name) {
  return spawnSync('sh', ['-c', `command -v ${name}`], { stdio: 'ignore' }).status === 0;
}

/** True when something accepts TCP connections on 127.0.0.1:port. */
export function portInUse(port, host = '127.0.0.1') {
  return new Promise((resolve) => {
    const socket = createConnection({ port, host });
    socket.once('connect', () => {
      socket.destroy();
      resolve(true);
    });
    socket.once('error', () => resolve(false));
    socket.setTimeout(1000, () => {
      socket.destroy();
      resolve(false);
    });
  });
}

export async function requireFreePort(port, what) {
  if (await portInUse(port)) {
    throw new SetupError(
      `port ${port} on 127.0.0.1 is already taken, so ${what} cannot start. ` +
        `Stop whatever listens there (\`ss -ltnp 'sport = :${port}'\` shows it) or set another port in .env.`,
    );
  }
}

/** Waits until `check` is true; past `timeoutMs` throws, naming `what` (a function is asked then, to say the state at that moment). */
export async function waitFor(check, { timeoutMs, intervalMs = 200, what }) {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (await check()) return;
    await new Promise((r) => setTimeout(r, intervalMs));
  }
  throw new SetupError(`${typeof what === 'function' ? what() : what} did not become ready within ${Math.round(timeoutMs / 1000)} s`);
}

const children = new Set();
const cleanups = [];

/** Starts a long-running child that is stopped when the script ends. */
export function startChild(command, args, options = {}) {
  const child = spawn(command, args, { stdio: 'inherit', ...options });
  children.add(child);
  child.once('exit', () => children.delete(child));
  return child;
}

/** Registers work to do when the script ends (after children are stopped), in reverse order. */
export function onCleanup(fn) {
  cleanups.push(fn);
}

function waitExit(child, ms) {
  return new Promise((resolve) => {
    if (child.exitCode !== null || child.signalCode !== null) return resolve();
    const timer = setTimeout(() => {
      child.kill('SIGKILL');
      resolve();
    }, ms);
    child.once('exit', () => {
      clearTimeout(timer);
      resolve();
    });
  });
}

let stopping = null;
export function stopAll() {
  stopping ??= (async () => {
    // Last started, first stopped, one after another: the app is down before the database it uses.
    for (const child of [...children].reverse()) {
      child.kill('SIGTERM');
      await waitExit(child, 10000);
    }
    for (const fn of cleanups.reverse()) {
      try {
        await fn();
      } catch (err) {
        log(`clean-up step failed: ${err.message}`);
      }
    }
  })();
  return stopping;
}

/** Wires SIGINT/SIGTERM to a clean stop of everything started, then exit. */
export function stopOnSignals() {
  for (const signal of ['SIGINT', 'SIGTERM', 'SIGHUP']) {
    process.on(signal, () => {
      log(`${signal} received, stopping`);
      stopAll().then(() => process.exit(signal === 'SIGINT' ? 130 : 143));
    });
  }
}

/** Runs a script's main function: a SetupError prints its message, anything else its stack; both exit 1. */
export function main(fn) {
  fn().then(
    (code) => stopAll().then(() => process.exit(code ?? 0)),
    (err) => {
      if (err instanceof SetupError) log(`error: ${err.message}`);
      else log(`unexpected error: ${err.stack ?? err}`);
      stopAll().then(() => process.exit(1));
    },
  );
}
