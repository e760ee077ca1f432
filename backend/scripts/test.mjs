// `npm test`: the same set-up as `npm start`, with a test database recreated for the run and fresh
// fakes on ports of their own (so a running `npm start` is not disturbed), then every test layer.
// Prints one summary line per layer and exits non-zero when any layer fails.
// For local work only: TEST_LAYERS=api,e2e runs the layers whose names contain those words, and
// arguments after `--` go to vitest (`npm test -- attachments` runs matching files).
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync, rmSync } from 'node:fs';
import { join, relative } from 'node:path';
import { DATA, ROOT, appEnvironment, settings } from './lib/env.mjs';
import { log, main, run, startChild, stopOnSignals } from './lib/proc.mjs';

const TEST = {
  dbName: process.env.TEST_DB_NAME ?? `${settings.dbName}_test`,
  appPort: Number(process.env.TEST_APP_PORT ?? 3100),
  smtpPort: Number(process.env.TEST_SMTP_PORT ?? 2525),
  mailApiPort: Number(process.env.TEST_MAIL_API_PORT ?? 2580),
  s3Port: Number(process.env.TEST_S3_PORT ?? 4570),
};
const RESULTS = join(DATA, 'test-results');
const VITEST = join(ROOT, 'node_modules', 'vitest', 'vitest.mjs');

/** Runs one vitest layer; returns its counts from vitest's JSON report. */
function runLayer(name, cwd, args, env) {
  const report = join(RESULTS, `${name.replace(/\W+/g, '-')}.json`);
  rmSync(report, { force: true });
  log(`layer: ${name}`);
  let exitCode = 0;
  try {
    run(process.execPath, [VITEST, 'run', ...args, '--reporter=default', '--reporter=json', `--outputFile.json=${report}`], { cwd, env });
  } catch {
    exitCode = 1;
  }
  if (!existsSync(report)) return { name, passed: 0, failed: 0, skipped: 0, ok: false, note: 'no report (the runner failed to start)' };
  const json = JSON.parse(readFileSync(report, 'utf8'));
  const passed = json.numPassedTests ?? 0;
  const failed = (json.numFailedTests ?? 0) + (json.numFailedTestSuites && !json.numFailedTests ? json.numFailedTestSuites : 0);
  const skipped = (json.numPendingTests ?? 0) + (json.numTodoTests ?? 0);
  const ok = exitCode === 0 && failed === 0 && passed > 0;
  return { name, passed, failed, skipped, ok, note: passed === 0 ? 'no test ran' : '', failures: failuresOf(json) };
}

/** Each failed test (or file that failed to load) with the first lines of its message, for the summary at the end. */
function failuresOf(json) {
  const out = [];
  for (const file of json.testResults ?? []) {
    const path = relative(ROOT, file.name ?? '');
    const failedTests = (file.assertionResults ?? []).filter((t) => t.status === 'failed');
    for (const t of failedTests) out.push({ where: `${path} > ${t.fullName ?? t.title}`, message: firstLines(t.failureMessages?.[0]) });
    if (!failedTests.length && file.status === 'failed') out.push({ where: path, message: firstLines(file.message) });
  }
  return out;
}

function firstLines(text) {
  return String(text ?? '')
    .replace(/\u001b\[[0-9;]*m/g, '')
    .split('\n')
    .filter((l) => l.trim())
    .slice(0, 3)
    .join(' | ')
    .slice(0, 400);
}

/** ESLint (eslint.config.mjs) and Prettier's check (.prettierrc.json) over the repository: one count each. */
function runLint(name) {
  log(`layer: ${name}`);
  const tools = [
    [join(ROOT, 'node_modules', 'eslint', 'bin', 'eslint.js'), ['.']],
    [join(ROOT, 'node_modules', 'prettier', 'bin', 'prettier.cjs'), ['--check', '.']],
  ];
  let passed = 0;
  let failed = 0;
  for (const [bin, args] of tools) {
    try {
      run(process.execPath, [bin, ...args], { cwd: ROOT });
      passed++;
    } catch {
      failed++;
    }
  }
  return { name, passed, failed, skipped: 0, ok: failed === 0, note: failed ? 'run `npm run lint`; `npm run format` fixes the formatting' : '' };
}

/** The first page's JavaScript against its budget (frontend/scripts/first-load.mjs, on the build just made): one count. */
function runFirstLoad(name) {
  log(`layer: ${name}`);
  try {
    run(process.execPath, [join(ROOT, 'frontend', 'scripts', 'first-load.mjs')], { cwd: ROOT });
    return { name, passed: 1, failed: 0, skipped: 0, ok: true, note: '' };
  } catch {
    return { name, passed: 0, failed: 1, skipped: 0, ok: false, note: 'the first page loads more JavaScript than its budget: see the files listed above' };
  }
}

/** Type-checks every project, tests included (the same as `npm run typecheck`); one count per project. */
function runTypecheck(name) {
  log(`layer: ${name}`);
  const TSC = join(ROOT, 'node_modules', 'typescript', 'bin', 'tsc');
  const projects = ['common/tsconfig.test.json', 'backend/tsconfig.test.json', 'frontend/tsconfig.json', 'reference-checks/tsconfig.json'];
  let passed = 0;
  let failed = 0;
  for (const project of projects) {
    try {
      run(process.execPath, [TSC, '-p', join(ROOT, project), '--noEmit'], { cwd: ROOT });
      passed++;
    } catch {
      failed++;
    }
  }
  return { name, passed, failed, skipped: 0, ok: failed === 0, note: '' };
}

/**
 * `npm run cluster:proof`, shortened (8 s phases), on ports of its own (CLUSTER_PORT_OFFSET) and in its own
 * directory: three Galera nodes and two apps behind HAProxy under load, a node and an app killed and
 * started again, every acknowledged save looked for on every node. One count.
 */
async function runClusterProof(name) {
  log(`layer: ${name}`);
  // In a process group of its own, so that a proof stuck past its own limits can be stopped with all it
  // started; whatever is left after it (its Galera nodes run detached) is found by its data directory.
  const child = startChild(process.execPath, [join(ROOT, 'backend', 'scripts', 'cluster-proof.mjs')], {
    cwd: ROOT,
    env: { ...process.env, PROOF_PHASE_SECONDS: process.env.PROOF_PHASE_SECONDS ?? '8', CLUSTER_PORT_OFFSET: '20000' },
    detached: true,
  });
  const group = (signal) => {
    try {
      process.kill(-child.pid, signal);
    } catch {
      // already gone
    }
  };
  // The proof bounds itself; this is the last guard, so that a stuck proof can never hold up the run.
  const guard = setTimeout(
    () => {
      log(`${name}: still running after 15 minutes; stopping it`);
      group('SIGTERM');
      setTimeout(() => group('SIGKILL'), 20000).unref();
    },
    15 * 60 * 1000,
  );
  const code = await new Promise((resolve) => child.once('exit', (c) => resolve(c ?? 1)));
  clearTimeout(guard);
  group('SIGKILL');
  spawnSync('pkill', ['-KILL', '-f', join(DATA, 'cluster-proof')], { stdio: 'ignore' });
  return code === 0
    ? { name, passed: 1, failed: 0, skipped: 0, ok: true, note: '' }
    : {
        name,
        passed: 0,
        failed: 1,
        skipped: 0,
        ok: false,
        note: 'an acknowledged save was lost, the nodes differ, the cluster did not start, or the proof ran past its time: see its output above',
      };
}

stopOnSignals();
main(async () => {
  const { ensureNodeModules } = await import('./lib/provision.mjs');
  ensureNodeModules();
  const { buildAll, ensureDatabase, ensureDebianPackages, migrateAndSeed, startApp, startFakes, startMariadb } = await import('./lib/provision.mjs');
  ensureDebianPackages('chromium', ['chromium'], 'the end-to-end tests');
  ensureDebianPackages('pdfsig', ['poppler-utils'], 'checking package signatures in tests');
  ensureDebianPackages('ngspice', ['ngspice'], "the network cell's reference checks (ngspice is their oracle, never part of the product)");
  await startMariadb();
  ensureDatabase(TEST.dbName, { recreate: true });
  const s3Dir = join(DATA, 'test-s3');
  rmSync(s3Dir, { recursive: true, force: true });
  await startFakes({ smtpPort: TEST.smtpPort, mailApiPort: TEST.mailApiPort, s3Port: TEST.s3Port, s3Dir });
  buildAll();
  mkdirSync(RESULTS, { recursive: true });

  const env = {
    ...appEnvironment({ dbName: TEST.dbName, appPort: TEST.appPort, smtpPort: TEST.smtpPort, s3Port: TEST.s3Port }),
    NODE_ENV: 'test',
    MAIL_API_URL: `http://127.0.0.1:${TEST.mailApiPort}`,
    APP_URL: `http://127.0.0.1:${TEST.appPort}`,
    // Fast hashing, and a per-address sign-in limit that many tests from one address stay under;
    // the per-account limit (5 a minute) is the one the tests exercise.
    BCRYPT_COST: '4',
    THROTTLE_AUTH_PER_ADDRESS: '1000',
    THROTTLE_VERIFY_PER_ADDRESS: '1000',
  };
  migrateAndSeed(env);

  const wanted = (process.env.TEST_LAYERS ?? '')
    .split(',')
    .map((w) => w.trim())
    .filter(Boolean);
  const extra = process.argv.slice(2);
  const selected = (name) => !wanted.length || wanted.some((w) => name.includes(w));
  const layers = [];
  const layer = (name, dir, args, layerEnv = env) => selected(name) && layers.push(runLayer(name, join(ROOT, dir), [...args, ...extra], layerEnv));
  if (selected('type check')) layers.push(runTypecheck('type check'));
  if (selected('lint')) layers.push(runLint('lint'));
  if (selected('first load')) layers.push(runFirstLoad('first load'));
  layer('common unit', 'common', []);
  layer('backend unit', 'backend', ['--project', 'unit']);
  layer('frontend unit', 'frontend', ['--project', 'unit']);
  layer('reference checks', 'reference-checks', []);
  layer('api integration', 'backend', ['--project', 'integration']);
  if (selected('end-to-end')) {
    log(`starting the built app for end-to-end tests on 127.0.0.1:${TEST.appPort}`);
    await startApp(env);
    layer('end-to-end', 'frontend', ['--project', 'e2e'], { ...env, E2E_BASE_URL: `http://127.0.0.1:${TEST.appPort}` });
  }
  if (selected('cluster proof')) layers.push(await runClusterProof('cluster proof'));

  const total = layers.reduce((acc, l) => ({ passed: acc.passed + l.passed, failed: acc.failed + l.failed, skipped: acc.skipped + l.skipped }), {
    passed: 0,
    failed: 0,
    skipped: 0,
  });
  process.stdout.write('\nTest layers\n');
  for (const l of layers) {
    process.stdout.write(
      `  ${l.ok ? 'PASS' : 'FAIL'}  ${l.name.padEnd(18)} ${l.passed} passed, ${l.failed} failed${l.skipped ? `, ${l.skipped} skipped` : ''}${l.note ? `  (${l.note})` : ''}\n`,
    );
  }
  process.stdout.write(`${total.passed} passed, ${total.failed} failed${total.skipped ? `, ${total.skipped} skipped` : ''}\n`);
  const failures = layers.flatMap((l) => (l.failures ?? []).map((f) => ({ layer: l.name, ...f })));
  if (failures.length) {
    process.stdout.write('\nFailed\n');
    for (const f of failures.slice(0, 20)) process.stdout.write(`  [${f.layer}] ${f.where}\n      ${f.message}\n`);
  }
  return layers.every((l) => l.ok) ? 0 : 1;
});
