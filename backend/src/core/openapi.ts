/**
 * The API describes itself: an OpenAPI 3 document made by @nestjs/swagger from the controllers, with the
 * request bodies described from the DTOs' class-validator rules — the same rules the validation pipe
 * enforces (class-validator-jsonschema) — served at /api/docs (a reader) and /api/docs/json.
 */
import type { INestApplication } from '@nestjs/common';
import { DocumentBuilder, SwaggerModule } from '@nestjs/swagger';
import { validationMetadatasToSchemas } from 'class-validator-jsonschema';
import { APP_VERSION } from '../version';
import { CSRF_HEADER, SESSION_COOKIE } from './guards/auth.guard';

const OPENAPI_PATH = 'api/docs';

export function describeApi(app: INestApplication): void {
  const config = new DocumentBuilder()
    .setTitle('Ampwright API')
    .setDescription(
      'Calculation sheets, their independent check and their signed packages. Sign in with POST /api/auth/login: the session is a cookie, ' +
        `and every state-changing request carries the session's anti-forgery token in the ${CSRF_HEADER} header. Errors have one shape: ` +
        '{ statusCode, code, message, details? }. Results are for qualified engineers, must be checked independently, and defer to local codes.',
    )
    .setVersion(APP_VERSION)
    .addCookieAuth(SESSION_COOKIE)
    .addApiKey({ type: 'apiKey', in: 'header', name: CSRF_HEADER }, 'csrf')
    .build();
  const document = SwaggerModule.createDocument(app, config);
  // The DTOs' rules as JSON Schema (only the request DTOs: the settings class is not part of the API).
  const fromRules = Object.fromEntries(
    Object.entries(validationMetadatasToSchemas({ refPointerPrefix: '#/components/schemas/' })).filter(([name]) => name.endsWith('Dto')),
  );
  document.components = {
    ...document.components,
    schemas: { ...document.components?.schemas, ...(fromRules as NonNullable<typeof document.components>['schemas']) },
  };
  SwaggerModule.setup(OPENAPI_PATH, app, document, {
    useGlobalPrefix: false,
    jsonDocumentUrl: `${OPENAPI_PATH}/json`,
    yamlDocumentUrl: `${OPENAPI_PATH}/yaml`,
  });
}
