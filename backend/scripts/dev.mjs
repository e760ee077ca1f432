// `npm run dev`: MariaDB and the fakes as for `npm start`, then the TypeScript compilers in watch
// mode, Nest restarted on every backend build, and Vite's dev server with hot reload on
// http://127.0.0.1:5173, which proxies /api to Nest on :3000.
import { join } from 'node:path';
import { ROOT, appEnvironment, settings } from './lib/env.mjs';
import { log, main, startChild, stopOnSignals } from './lib/proc.mjs';

stopOnSignals();
main(async () => {
  const { ensureNodeModules } = await import('./lib/provision.mjs');
  ensureNodeModules();
  const { buildCommon, ensureDatabase, migrateAndSeed, startFakes, startMariadb } = await import('./lib/provision.mjs');
  await startMariadb();
  ensureDatabase(settings.dbName);
  await startFakes();
  buildCommon();
  const tsc = join(ROOT, 'node_modules', 'typescript', 'bin', 'tsc');
  const { run } = await import('./lib/proc.mjs');
  run(process.execPath, [tsc, '-p', join(ROOT, 'backend', 'tsconfig.build.json')]);
  const env = { ...appEnvironment(), NODE_ENV: 'development', STATIC_DIR: '' };
  migrateAndSeed(env);
  startChild(process.execPath, [tsc, '-p', join(ROOT, 'common', 'tsconfig.build.json'), '--watch', '--preserveWatchOutput'], { cwd: ROOT });
  startChild(process.execPath, [tsc, '-p', join(ROOT, 'backend', 'tsconfig.build.json'), '--watch', '--preserveWatchOutput'], { cwd: ROOT });
  startChild(
    process.execPath,
    [
      '--watch-path',
      join(ROOT, 'backend', 'dist'),
      '--watch-path',
      join(ROOT, 'common', 'dist'),
      '--enable-source-maps',
      join(ROOT, 'backend', 'dist', 'main.js'),
    ],
    { env },
  );
  const vite = startChild(process.execPath, [join(ROOT, 'node_modules', 'vite', 'bin', 'vite.js')], { cwd: join(ROOT, 'frontend') });
  log('dev servers starting: open http://127.0.0.1:5173 (Ctrl-C stops everything)');
  return new Promise((resolve) => vite.once('exit', (code) => resolve(code ?? 0)));
});
