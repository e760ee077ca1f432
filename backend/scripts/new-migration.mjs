// `npm run migration:new -w backend`: writes a migration for the entity changes. It builds the
// backend, applies the committed migrations to a scratch database on our MariaDB, then asks MikroORM
// for the difference. Rebuild afterwards (`npm run build -w backend`) and commit the new file.
import { join } from 'node:path';
import { appEnvironment, ROOT } from './lib/env.mjs';
import { log, main, run } from './lib/proc.mjs';
import { buildCommon, ensureDatabase, startMariadb } from './lib/provision.mjs';

main(async () => {
  buildCommon();
  run('npm', ['run', '-s', 'build', '-w', 'backend'], { cwd: ROOT, failure: 'the backend does not build' });
  await startMariadb();
  const name = 'ampwright_scratch';
  ensureDatabase(name, { recreate: true });
  const env = appEnvironment({ dbName: name });
  const migrate = join(ROOT, 'backend', 'dist', 'database', 'migrate.js');
  run(process.execPath, [migrate], { env, failure: 'the committed migrations do not apply' });
  run(process.execPath, [migrate, '--create'], { env, failure: 'the migration could not be written' });
  log('done: rebuild the backend and commit the new file in backend/src/database/migrations');
  return 0;
});
