import { existsSync } from 'node:fs';
import { MikroOrmModule } from '@mikro-orm/nestjs';
import { DynamicModule, MiddlewareConsumer, Module, NestModule } from '@nestjs/common';
import { ConfigService } from '@nestjs/config';
import { APP_FILTER, APP_GUARD } from '@nestjs/core';
import { ServeStaticModule } from '@nestjs/serve-static';
import { ThrottlerGuard, ThrottlerModule } from '@nestjs/throttler';
import { ConfigModule } from './config/config.module';
import type { Environment } from './config/environment';
import { AllExceptionsFilter } from './core/filters/all-exceptions.filter';
import { RequestLoggerMiddleware } from './core/middleware/request-logger.middleware';
import { ormConfig } from './database/mikro-orm.config';
import { EvaluationModule } from './evaluation/evaluation.module';
import { FilesModule } from './files/files.module';
import { HealthModule } from './health/health.module';
import { MailModule } from './mail/mail.module';

/** The built front end, when there is one: client routes fall back to its index.html; /api never does. */
function staticFrontEnd(): DynamicModule[] {
  const dir = process.env.STATIC_DIR;
  if (!dir || !existsSync(dir)) return [];
  return [ServeStaticModule.forRoot({ rootPath: dir, exclude: ['/api/{*path}'], serveStaticOptions: { index: 'index.html', maxAge: 0 } })];
}

@Module({
  imports: [
    ConfigModule,
    MikroOrmModule.forRootAsync({
      inject: [ConfigService],
      useFactory: (config: ConfigService<Environment, true>) =>
        ormConfig({
          DB_HOST: config.get('DB_HOST', { infer: true }),
          DB_PORT: config.get('DB_PORT', { infer: true }),
          DB_NAME: config.get('DB_NAME', { infer: true }),
          DB_USER: config.get('DB_USER', { infer: true }),
          DB_PASSWORD: config.get('DB_PASSWORD', { infer: true }),
        }),
    }),
    ThrottlerModule.forRoot({ throttlers: [{ name: 'default', ttl: 60_000, limit: 600 }], errorMessage: 'Too many requests: wait a minute and try again.' }),
    MailModule,
    FilesModule,
    HealthModule,
    EvaluationModule,
    ...staticFrontEnd(),
  ],
  providers: [
    { provide: APP_GUARD, useClass: ThrottlerGuard },
    { provide: APP_FILTER, useClass: AllExceptionsFilter },
  ],
})
export class AppModule implements NestModule {
  configure(consumer: MiddlewareConsumer): void {
    consumer.apply(RequestLoggerMiddleware).forRoutes('*');
  }
}
