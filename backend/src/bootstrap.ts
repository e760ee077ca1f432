import { INestApplication } from '@nestjs/common';
import { ConfigService } from '@nestjs/config';
import { NestFactory } from '@nestjs/core';
import type { Environment } from './config/environment';
import { NestExpressApplication } from '@nestjs/platform-express';
import cookieParser from 'cookie-parser';
import helmet from 'helmet';
import { AppModule } from './app.module';
import { json, type NextFunction, type Request, type Response } from 'express';
import { createLogger } from './core/logger';
import { assignRequestId } from './core/middleware/request-id';
import { describeApi } from './core/openapi';
import { createValidationPipe } from './core/validation';
import { bodyParserError } from './core/filters/body-parser-error';
import { ErrorCode, RequestException } from './core/errors/app-exception';

/** Applies what every instance of the app needs, in main.ts and in the integration tests alike. */
export function configureApp(app: INestApplication): INestApplication {
  const express = app as NestExpressApplication;
  express.disable('x-powered-by');
  express.use(assignRequestId);
  const trust = app.get(ConfigService<Environment, true>).get('TRUST_PROXY', { infer: true });
  express.set('trust proxy', /^\d+$/.test(trust) ? Number(trust) : trust.split(',').map((s) => s.trim()));
  // A body is JSON, or a multipart form for a file; anything else is refused before it is read.
  express.use('/api', (req: Request, _res: Response, next: NextFunction) => {
    const length = Number(req.get('content-length') ?? 0);
    const hasBody = length > 0 || req.get('transfer-encoding') !== undefined;
    if (hasBody && !req.is(['application/json', 'application/*+json', 'multipart/form-data'])) {
      return next(
        new RequestException(
          ErrorCode.UnsupportedMediaType,
          `The request body is ${req.get('content-type') ?? 'of no stated type'}; send it as application/json (or multipart/form-data with a file).`,
        ),
      );
    }
    next();
  });
  // A cell's body may carry a table of up to 200 000 values (TABLE_MAX_VALUES): the routes that save a cell
  // read up to 8 MB of JSON; every other route 2 MB. The second parser passes over a body already read.
  express.use(/^\/api\/sheets\/[^/]+\/cells(\/[^/]+)?$/, json({ limit: '8mb' }));
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
  // The built front end: hashed assets (a new build has new names) are kept a year; the page itself is asked
  // for again every time, so a new build is seen at once; source maps stay in the build folder, never served.
  express.use((req: Request, res: Response, next: NextFunction) => {
    if (req.path.startsWith('/api/') || req.path === '/api') return next();
    if (req.path.endsWith('.map')) return res.status(404).type('text/plain').send('Not found');
    res.setHeader('Cache-Control', req.path.startsWith('/assets/') ? 'public, max-age=31536000, immutable' : 'no-cache');
    next();
  });
  express.use(cookieParser());
  app.setGlobalPrefix('api');
  app.useGlobalPipes(createValidationPipe());
  describeApi(app);
  app.enableShutdownHooks();
  return app;
}

export async function createApp(): Promise<INestApplication> {
  const app = await NestFactory.create<NestExpressApplication>(AppModule, { bufferLogs: false, bodyParser: false, logger: createLogger() });
  return configureApp(app);
}
