/**
 * Applies the committed migrations (`npm run migrate -w backend`), or with --create writes a new one
 * from the difference between the entities and the schema snapshot (then rebuild and commit it).
 */
import 'reflect-metadata';
import { MikroORM } from '@mikro-orm/mariadb';
import { validateEnvironment } from '../config/environment';
import { ormConfig } from './mikro-orm.config';

async function migrate() {
  const orm = await MikroORM.init(ormConfig(validateEnvironment(process.env)));
  try {
    const migrator = orm.getMigrator();
    if (process.argv.includes('--create')) {
      const created = await migrator.createMigration();
      console.log(created.fileName ? `created ${created.fileName}` : 'no schema changes to migrate');
      return;
    }
    const applied = await migrator.up();
    console.log(applied.length ? `applied ${applied.map((m) => m.name).join(', ')}` : 'schema is up to date');
  } finally {
    await orm.close(true);
  }
}

migrate().catch((err: Error) => {
  console.error(`migration failed: ${err.message}`);
  process.exit(1);
});
