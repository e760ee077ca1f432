import { existsSync } from 'node:fs';
import { MariaDbDriver } from '@mikro-orm/mariadb';
import { MikroOrmModule } from '@mikro-orm/nestjs';
import { MiddlewareConsumer, Module, NestModule } from '@nestjs/common';
import { ConfigService } from '@nestjs/config';
import { APP_FILTER, APP_GUARD } from '@nestjs/core';
import { ServeStaticModule } from '@nestjs/serve-static';
import { ThrottlerGuard, ThrottlerModule } from '@nestjs/throttler';
import { MikroORM } from '@mikro-orm/core';
import { SharedThrottlerStorage } from './core/throttle/shared-throttler-storage';
import { AuditModule } from './audit/audit.module';
import { AuthModule } from './auth/auth.module';
import { ConfigModule } from './config/config.module';
import { AuthGuard } from './core/guards/auth.guard';
import { THROTTLERS } from './core/throttle/throttlers';
import { InvitationsModule } from './invitations/invitations.module';
import { MembersModule } from './members/members.module';
import { ProjectsModule } from './projects/projects.module';
import { SheetsModule } from './sheets/sheets.module';
import { AttachmentsModule } from './attachments/attachments.module';
import { ReviewModule } from './review/review.module';
import { PackagesModule } from './packages/packages.module';
import { NotificationsModule } from './notifications/notifications.module';
import { TemplatesModule } from './templates/templates.module';
import type { Environment } from './config/environment';
import { AllExceptionsFilter } from './core/filters/all-exceptions.filter';
import { RequestLoggerMiddleware } from './core/middleware/request-logger.middleware';
import { ServerTimingMiddleware } from './core/timing/server-timing';
import { ormConfig } from './database/mikro-orm.config';
import { EvaluationModule } from './evaluation/evaluation.module';
import { DemoAccountsCheck } from './database/demo-accounts.check';
import { FilesModule } from './files/files.module';
import { HealthModule } from './health/health.module';
import { MetricsModule } from './metrics/metrics.module';
import { MailModule } from './mail/mail.module';

/** The built front end, when there is one (STATIC_DIR): client routes fall back to its index.html; /api never does. */
const staticFrontEnd = ServeStaticModule.forRootAsync({
  inject: [ConfigService],
  useFactory: (config: ConfigService<Environment, true>) => {
    const dir = config.get('STATIC_DIR', { infer: true });
    return dir && existsSync(dir) ? [{ rootPath: dir, exclude: ['/api/{*path}'], serveStaticOptions: { index: 'index.html', cacheControl: false } }] : [];
  },
});

@Module({
  imports: [
    ConfigModule,
    MikroOrmModule.forRootAsync({
      driver: MariaDbDriver,
      inject: [ConfigService],
      useFactory: (config: ConfigService<Environment, true>) =>
        ormConfig({
          DB_HOST: config.get('DB_HOST', { infer: true }),
          DB_PORT: config.get('DB_PORT', { infer: true }),
          DB_SOCKET: config.get('DB_SOCKET', { infer: true }),
          DB_NAME: config.get('DB_NAME', { infer: true }),
          DB_USER: config.get('DB_USER', { infer: true }),
          DB_PASSWORD: config.get('DB_PASSWORD', { infer: true }),
          DB_POOL_SIZE: config.get('DB_POOL_SIZE', { infer: true }),
        }),
    }),
    ThrottlerModule.forRootAsync({
      inject: [MikroORM],
      useFactory: (orm: MikroORM) => ({
        throttlers: THROTTLERS,
        storage: new SharedThrottlerStorage(orm),
        errorMessage: 'Too many attempts: wait a minute and try again.',
      }),
    }),
    AuditModule,
    AuthModule,
    InvitationsModule,
    MembersModule,
    ProjectsModule,
    SheetsModule,
    AttachmentsModule,
    ReviewModule,
    PackagesModule,
    NotificationsModule,
    TemplatesModule,
    MailModule,
    FilesModule,
    HealthModule,
    MetricsModule,
    EvaluationModule,
    staticFrontEnd,
  ],
  providers: [
    // Access first: a caller without the right gets 401/403 and does not use up anyone's allowance.
    { provide: APP_GUARD, useClass: AuthGuard },
    { provide: APP_GUARD, useClass: ThrottlerGuard },
    { provide: APP_FILTER, useClass: AllExceptionsFilter },
    DemoAccountsCheck,
  ],
})
export class AppModule implements NestModule {
  configure(consumer: MiddlewareConsumer): void {
    consumer.apply(RequestLoggerMiddleware, ServerTimingMiddleware).forRoutes('{*path}');
  }
}
