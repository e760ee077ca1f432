import { join } from 'node:path';
import { defineConfig } from '@mikro-orm/mariadb';
import { Migrator } from '@mikro-orm/migrations';
import { ENTITIES } from './entities';
import type { Environment } from '../config/environment';

/**
 * One ORM configuration for the app and the migration script. The schema is only ever changed by
 * the committed migrations (src/database/migrations); there is no schema sync at runtime.
 * MariaDB cannot mix DDL and transactions, hence the non-transactional migrations.
 */
export function ormConfig(env: Pick<Environment, 'DB_HOST' | 'DB_PORT' | 'DB_SOCKET' | 'DB_NAME' | 'DB_USER' | 'DB_PASSWORD' | 'DB_POOL_SIZE'>) {
  return defineConfig({
    host: env.DB_HOST,
    port: env.DB_PORT,
    dbName: env.DB_NAME,
    user: env.DB_USER,
    password: env.DB_PASSWORD,
    entities: ENTITIES,
    extensions: [Migrator],
    allowGlobalContext: false,
    forceUtcTimezone: true,
    pool: { min: 0, max: env.DB_POOL_SIZE },
    // Through the Unix socket when there is one (a database on this machine); host and port otherwise.
    driverOptions: { connection: { connectTimeout: 3000, ...(env.DB_SOCKET ? { socketPath: env.DB_SOCKET } : {}) } },
    migrations: {
      tableName: 'schema_migration',
      path: join(__dirname, 'migrations'),
      pathTs: join(__dirname, '..', '..', 'src', 'database', 'migrations'),
      glob: '!(*.d).{js,ts}',
      transactional: false,
      allOrNothing: false,
      snapshot: true,
      snapshotName: '.snapshot-ampwright',
      emit: 'ts',
    },
  });
}
