/**
 * The demo seed, for local use only: the invented firm Northfold Engineering and its people (PRODUCT.md).
 * Idempotent: running it again changes nothing that is already there.
 */
import 'reflect-metadata';
import { MikroORM } from '@mikro-orm/mariadb';
import { NestFactory } from '@nestjs/core';
import { AppModule } from '../app.module';
import { validateEnvironment } from '../config/environment';
import { ormConfig } from './mikro-orm.config';
import { seedDemoReview } from './seeders/demo-review';
import { seedDemo } from './seeders/demo.seeder';

async function seed() {
  const env = validateEnvironment(process.env);
  if (env.NODE_ENV === 'production')
    throw new Error('the demo seed is for local use only: it creates accounts with a published password, so it never runs with NODE_ENV=production');
  const orm = await MikroORM.init(ormConfig(env));
  try {
    console.log(await seedDemo(orm.em.fork(), env.BCRYPT_COST));
  } finally {
    await orm.close(true);
  }
  // The issued revision goes through the app's own services (evaluation, snapshot, notifications);
  // its package is left queued for the app's worker, not made by this short-lived process.
  process.env.PACKAGE_WORKER = 'false';
  const app = await NestFactory.createApplicationContext(AppModule, { logger: ['error', 'warn'] });
  try {
    const issued = await seedDemoReview(app);
    if (issued) console.log(`demo seed: ${issued}`);
  } finally {
    await app.close();
  }
}

seed().catch((err: Error) => {
  console.error(`seed failed: ${err.message}`);
  process.exit(1);
});
