// The set-up shared by `npm start`, `npm run dev` and `npm test`: dependencies, our private
// MariaDB on 127.0.0.1:3307, the local fakes, and builds that are out of date.
import { existsSync, mkdirSync, readFileSync, readdirSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { spawnSync } from 'node:child_process';
import { DATA, ROOT, settings } from './env.mjs';
import { SetupError, commandExists, log, onCleanup, portInUse, requireFreePort, run, startChild, waitFor } from './proc.mjs';

const NPM = process.platform === 'win32' ? 'npm.cmd' : 'npm';

/** `npm ci` when node_modules is missing or older than package-lock.json. */
export function ensureNodeModules() {
  const marker = join(ROOT, 'node_modules', '.package-lock.json');
  const lock = join(ROOT, 'package-lock.json');
  if (existsSync(marker) && statSync(marker).mtimeMs >= statSync(lock).mtimeMs) return;
  log('installing npm dependencies (npm ci)');
  run(NPM, ['ci', '--no-audit', '--no-fund'], { cwd: ROOT, failure: 'npm ci failed: read the npm output above; check the network to the npm registry' });
}

/** Installs Debian packages when one of their commands is missing. */
export function ensureDebianPackages(command, packages, purpose) {
  if (commandExists(command)) return;
  if (process.getuid?.() !== 0) {
    throw new SetupError(`${command} is missing and only root can install it. Run: sudo apt-get install -y ${packages.join(' ')}  (needed for ${purpose})`);
  }
  log(`installing ${packages.join(', ')} from Debian (needed for ${purpose})`);
  const failure = `apt-get could not install ${packages.join(' ')}: read the apt output above, then run the command again`;
  run('apt-get', ['update', '-qq'], { failure });
  run('apt-get', ['install', '-y', '-qq', '--no-install-recommends', ...packages], {
    env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' },
    failure,
  });
  if (!commandExists(command)) throw new SetupError(`${packages.join(' ')} installed but ${command} is still not on PATH`);
}

const MARIADB = {
  dir: join(DATA, 'mariadb'),
  run: join(DATA, 'run'),
  get socket() {
    return join(this.run, 'mysqld.sock');
  },
  get pidFile() {
    return join(this.run, 'mysqld.pid');
  },
  get logFile() {
    return join(this.run, 'mysqld.err');
  },
};

function mariadbAdmin(...args) {
  return spawnSync('mariadb-admin', ['--no-defaults', `--socket=${MARIADB.socket}`, '-uroot', ...args], { stdio: 'pipe', encoding: 'utf8' });
}

const mariadbAnswers = () => mariadbAdmin('ping').status === 0;

function tailOf(file, lines = 20) {
  if (!existsSync(file)) return '(no log)';
  return readFileSync(file, 'utf8').trim().split('\n').slice(-lines).join('\n');
}

/**
 * Starts our own mariadbd unless it already runs. It gets its own process group, so a Ctrl-C on the
 * terminal does not kill it mid-write: it is stopped with a clean shutdown when the script ends.
 */
export async function startMariadb() {
  ensureDebianPackages('mariadbd', ['mariadb-server', 'mariadb-client'], 'the database');
  mkdirSync(MARIADB.run, { recursive: true });
  if (mariadbAnswers()) {
    log('our MariaDB is already running; using it');
    return;
  }
  if (!existsSync(join(MARIADB.dir, 'mysql'))) {
    log(`initialising a private MariaDB data directory in ${MARIADB.dir}`);
    mkdirSync(MARIADB.dir, { recursive: true });
    run('mariadb-install-db', ['--no-defaults', `--datadir=${MARIADB.dir}`, '--user=root', '--auth-root-authentication-method=normal', '--skip-test-db'], {
      stdio: ['ignore', 'ignore', 'inherit'],
      failure: 'mariadb-install-db failed; remove .data/mariadb if it is half-made and try again',
    });
  }
  await requireFreePort(settings.dbPort, 'MariaDB');
  log(`starting MariaDB on 127.0.0.1:${settings.dbPort}`);
  // As a batch task (SCHED_BATCH, util-linux's chrt): its threads, woken by each statement the app sends, then
  // do not preempt the app's one event-loop thread on the cores they share; they still get their fair share.
  // On this 2-core machine that is 10-13 % more reads and saves a second at saturation (README, Performance).
  const [command, ...asBatch] = commandExists('chrt') ? ['chrt', '--batch', '0', 'mariadbd'] : ['mariadbd'];
  const child = startChild(
    command,
    [
      ...asBatch,
      '--no-defaults',
      `--datadir=${MARIADB.dir}`,
      `--socket=${MARIADB.socket}`,
      `--pid-file=${MARIADB.pidFile}`,
      `--port=${settings.dbPort}`,
      '--bind-address=127.0.0.1',
      '--user=root',
      '--skip-name-resolve',
      '--skip-log-bin',
      `--log-error=${MARIADB.logFile}`,
      '--character-set-server=utf8mb4',
      '--collation-server=utf8mb4_unicode_ci',
      // Statements of many connections (the app keeps DB_POOL_SIZE) on a thread per core, not a thread per
      // connection fighting for the cores.
      '--thread-handling=pool-of-threads',
    ],
    { stdio: 'ignore', detached: true },
  );
  let exited = false;
  child.once('exit', () => {
    exited = true;
  });
  try {
    await waitFor(
      () => {
        if (exited) throw new SetupError(`MariaDB exited at start-up. Its log:\n${tailOf(MARIADB.logFile)}`);
        return mariadbAnswers();
      },
      { timeoutMs: 60000, what: 'MariaDB' },
    );
  } catch (err) {
    if (err instanceof SetupError && !exited) throw new SetupError(`${err.message}. Its log:\n${tailOf(MARIADB.logFile)}`);
    throw err;
  }
  onCleanup(async () => {
    log('stopping MariaDB (clean shutdown)');
    mariadbAdmin('shutdown');
  });
}

const sqlString = (s) => `'${String(s).replace(/\\/g, '\\\\').replace(/'/g, "\\'")}'`;
const sqlName = (s) => {
  if (!/^[A-Za-z0-9_]+$/.test(s)) throw new SetupError(`database and user names may hold letters, digits and _ only: ${s}`);
  return s;
};

/** Creates (or, with recreate, drops and creates) a database and grants our application user on it. */
export function ensureDatabase(name, { recreate = false } = {}) {
  const db = sqlName(name);
  const user = sqlName(settings.dbUser);
  const statements = [
    recreate ? `DROP DATABASE IF EXISTS \`${db}\`` : null,
    `CREATE DATABASE IF NOT EXISTS \`${db}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`,
    ...['127.0.0.1', 'localhost'].flatMap((host) => [
      `CREATE USER IF NOT EXISTS '${user}'@'${host}' IDENTIFIED BY ${sqlString(settings.dbPassword)}`,
      `ALTER USER '${user}'@'${host}' IDENTIFIED BY ${sqlString(settings.dbPassword)}`,
      `GRANT ALL PRIVILEGES ON \`${db}\`.* TO '${user}'@'${host}'`,
    ]),
  ].filter(Boolean);
  const result = spawnSync('mariadb', ['--no-defaults', `--socket=${MARIADB.socket}`, '-uroot'], {
    input: statements.join(';\n') + ';\n',
    encoding: 'utf8',
    stdio: ['pipe', 'pipe', 'pipe'],
  });
  if (result.status !== 0) throw new SetupError(`could not create database ${db}: ${result.stderr.trim()}`);
}

/** Starts the SMTP sink and the S3 fake in one child process (backend/scripts/fakes.mjs). */
export async function startFakes({
  smtpPort = settings.smtpPort,
  mailApiPort = settings.mailApiPort,
  s3Port = settings.s3Port,
  s3Dir = join(DATA, 's3'),
} = {}) {
  await requireFreePort(smtpPort, 'the SMTP sink');
  await requireFreePort(mailApiPort, "the SMTP sink's reading API");
  await requireFreePort(s3Port, 'the S3 fake');
  mkdirSync(s3Dir, { recursive: true });
  log(`starting the local fakes: SMTP 127.0.0.1:${smtpPort} (messages at http://127.0.0.1:${mailApiPort}/messages), S3 http://127.0.0.1:${s3Port}`);
  const child = startChild(process.execPath, [join(ROOT, 'backend', 'scripts', 'fakes.mjs')], {
    env: { ...process.env, SMTP_PORT: String(smtpPort), MAIL_API_PORT: String(mailApiPort), S3_PORT: String(s3Port), S3_DIR: s3Dir },
    stdio: ['ignore', 'inherit', 'inherit'],
  });
  let exited = false;
  child.once('exit', () => {
    exited = true;
  });
  await waitFor(
    async () => {
      if (exited) throw new SetupError('the local fakes exited at start-up (see their output above)');
      return (await portInUse(smtpPort)) && (await portInUse(s3Port)) && (await portInUse(mailApiPort));
    },
    { timeoutMs: 20000, what: 'the local fakes' },
  );
}

function newestMtime(path) {
  if (!existsSync(path)) return 0;
  const stat = statSync(path);
  if (!stat.isDirectory()) return stat.mtimeMs;
  let newest = stat.mtimeMs;
  for (const entry of readdirSync(path)) {
    if (entry === 'node_modules' || entry === 'dist') continue;
    newest = Math.max(newest, newestMtime(join(path, entry)));
  }
  return newest;
}

/** Builds a workspace when its stamp is older than any of its inputs. */
function buildIfStale(workspace, inputs) {
  const stamp = join(ROOT, workspace, 'dist', '.build-stamp');
  const newestInput = Math.max(...inputs.map((p) => newestMtime(join(ROOT, p))));
  if (existsSync(stamp) && statSync(stamp).mtimeMs >= newestInput) return;
  log(`building ${workspace}`);
  run(NPM, ['run', '-s', 'build', '-w', workspace], { cwd: ROOT, failure: `the ${workspace} build failed (see the compiler output above)` });
  mkdirSync(join(ROOT, workspace, 'dist'), { recursive: true });
  writeFileSync(stamp, new Date().toISOString());
}

export function buildAll() {
  buildIfStale('common', ['common/src', 'common/package.json', 'common/tsconfig.json', 'package-lock.json']);
  buildIfStale('backend', ['backend/src', 'backend/package.json', 'backend/tsconfig.json', 'common/src', 'package-lock.json']);
  buildIfStale('frontend', ['frontend/src', 'frontend/index.html', 'frontend/package.json', 'frontend/vite.config.ts', 'common/src', 'package-lock.json']);
}

export function buildCommon() {
  buildIfStale('common', ['common/src', 'common/package.json', 'common/tsconfig.json', 'package-lock.json']);
}

/** Runs the committed migrations, then (unless told not to) the idempotent demo seed. */
export function migrateAndSeed(env, { seed = true } = {}) {
  log(`migrating database ${env.DB_NAME}`);
  run(process.execPath, [join(ROOT, 'backend', 'dist', 'database', 'migrate.js')], { env, failure: 'the database migration failed (see above)' });
  if (!seed) return;
  log('seeding the demo data');
  run(process.execPath, [join(ROOT, 'backend', 'dist', 'database', 'seed.js')], { env, failure: 'the demo seed failed (see above)' });
}

/** Starts the built app and waits until /api/health answers. */
export async function startApp(env) {
  const port = Number(env.APP_PORT);
  await requireFreePort(port, 'the app');
  const child = startChild(process.execPath, ['--enable-source-maps', join(ROOT, 'backend', 'dist', 'main.js')], { env });
  let exited = false;
  child.once('exit', () => {
    exited = true;
  });
  await waitFor(
    async () => {
      if (exited) throw new SetupError('the app exited at start-up (see its output above)');
      try {
        const res = await fetch(`http://127.0.0.1:${port}/api/health`);
        return res.status === 200 || res.status === 503;
      } catch {
        return false;
      }
    },
    { timeoutMs: 60000, what: 'the app' },
  );
  return child;
}
