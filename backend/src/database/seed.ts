/**
 * The demo seed, for local use only: the invented firm Northfold Engineering and its people (PRODUCT.md).
 * Idempotent: running it again changes nothing that is already there.
 */
import 'reflect-metadata';
import { MikroORM } from '@mikro-orm/mariadb';
import { validateEnvironment } from '../config/environment';
import { ormConfig } from './mikro-orm.config';
import { seedDemo } from './seeders/demo.seeder';

async function seed() {
  const env = validateEnvironment(process.env);
  const orm = await MikroORM.init(ormConfig(env));
  try {
    const summary = await seedDemo(orm.em.fork(), env.BCRYPT_COST);
    console.log(summary);
  } finally {
    await orm.close(true);
  }
}

seed().catch((err: Error) => {
  console.error(`seed failed: ${err.message}`);
  process.exit(1);
});
