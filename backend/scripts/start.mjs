// `npm start`: everything a fresh machine needs, then the app on http://127.0.0.1:3000.
// Ctrl-C stops the app, the fakes and (with a clean shutdown) MariaDB.
import { main, log, stopOnSignals } from './lib/proc.mjs';
import { appEnvironment, settings } from './lib/env.mjs';

stopOnSignals();
main(async () => {
  const { ensureNodeModules } = await import('./lib/provision.mjs');
  ensureNodeModules();
  const { buildAll, ensureDatabase, migrateAndSeed, startApp, startFakes, startMariadb } = await import('./lib/provision.mjs');
  await startMariadb();
  ensureDatabase(settings.dbName);
  await startFakes();
  buildAll();
  const env = appEnvironment();
  migrateAndSeed(env);
  const app = await startApp(env);
  log(`Ampwright is up at http://${settings.appHost}:${settings.appPort}  (Ctrl-C stops everything)`);
  log('demo sign-in and data: see README.md, "Demo data"');
  return new Promise((resolve) => app.once('exit', (code) => resolve(code ?? 1)));
});
