import { INestApplication } from '@nestjs/common';
import { NestFactory } from '@nestjs/core';
import { NestExpressApplication } from '@nestjs/platform-express';
import cookieParser from 'cookie-parser';
import helmet from 'helmet';
import { AppModule } from './app.module';
import type { NextFunction, Request, Response } from 'express';
import { createValidationPipe } from './core/validation';
import { bodyParserError } from './core/filters/body-parser-error';

/** Applies what every instance of the app needs, in main.ts and in the integration tests alike. */
export function configureApp(app: INestApplication): INestApplication {
  const express = app as NestExpressApplication;
  express.disable('x-powered-by');
  express.set('trust proxy', 'loopback');
  express.useBodyParser('json', { limit: '2mb' });
  // Body-parser failures become our own exceptions here, before Nest rewraps them with the parser's wording.
  express.use((err: unknown, _req: Request, _res: Response, next: NextFunction) => next(bodyParserError(err) ?? err));
  express.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          defaultSrc: ["'self'"],
          scriptSrc: ["'self'"],
          styleSrc: ["'self'", "'unsafe-inline'"],
          fontSrc: ["'self'", 'data:'],
          imgSrc: ["'self'", 'data:', 'blob:'],
          connectSrc: ["'self'"],
          objectSrc: ["'none'"],
          frameAncestors: ["'none'"],
        },
      },
    }),
  );
  express.use(cookieParser());
  app.setGlobalPrefix('api');
  app.useGlobalPipes(createValidationPipe());
  app.enableShutdownHooks();
  return app;
}

export async function createApp(): Promise<INestApplication> {
  const app = await NestFactory.create<NestExpressApplication>(AppModule, { bufferLogs: false, bodyParser: false });
  return configureApp(app);
}
