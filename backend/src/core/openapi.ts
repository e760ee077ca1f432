/**
 * The API describes itself: an OpenAPI 3.1 document made by @nestjs/swagger from the controllers, with the
 * request bodies described from the DTOs' class-validator rules — the same rules the validation pipe
 * enforces (class-validator-jsonschema) — and each route's answer from the controller's declared return
 * type (api-schemas.json, written by `npm run api:schemas -w backend`; the sheet format's parts from its zod
 * schemas), served at /api/docs (a reader) and /api/docs/json.
 */
import type { INestApplication } from '@nestjs/common';
import { DocumentBuilder, SwaggerModule, type OpenAPIObject } from '@nestjs/swagger';
import { validationMetadatasToSchemas } from 'class-validator-jsonschema';
import { APP_VERSION } from '../version';
import written from './api-schemas.json';
import { CSRF_HEADER, SESSION_COOKIE } from './guards/auth.guard';

const OPENAPI_PATH = 'api/docs';

type Schemas = NonNullable<OpenAPIObject['components']>['schemas'];
/** The answers' description: per operation (`<Controller>_<method>`), and the schemas they refer to. */
const answers = written as unknown as { operations: Record<string, { schema?: object; file?: true; empty?: true }>; definitions: Schemas };

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
    schemas: {
      ...document.components?.schemas,
      ...(fromRules as NonNullable<typeof document.components>['schemas']),
      ...answers.definitions,
    },
  };
  describeAnswers(document);
  // The answers' schemas are JSON Schema 2020-12 (null as a type, const), which OpenAPI 3.1 takes as they are.
  document.openapi = '3.1.0';
  SwaggerModule.setup(OPENAPI_PATH, app, document, {
    useGlobalPrefix: false,
    jsonDocumentUrl: `${OPENAPI_PATH}/json`,
    yamlDocumentUrl: `${OPENAPI_PATH}/yaml`,
  });
}

type Operation = { operationId?: string; responses?: Record<string, { description?: string; content?: Record<string, unknown> }> };

/** Each operation's success answer: its JSON schema, a file, or nothing (204). */
function describeAnswers(document: OpenAPIObject): void {
  const operations = answers.operations;
  for (const path of Object.values(document.paths)) {
    for (const op of Object.values(path as Record<string, Operation>)) {
      const answer = op.operationId ? operations[op.operationId] : undefined;
      if (!answer || !op.responses) continue;
      const status = Object.keys(op.responses).find((code) => code.startsWith('2')) ?? '200';
      const response = op.responses[status] ?? {};
      if (answer.schema) response.content = { 'application/json': { schema: answer.schema } };
      else if (answer.file) response.content = { 'application/octet-stream': { schema: { type: 'string', format: 'binary' } } };
      response.description ||= answer.empty ? 'Done; nothing to answer.' : answer.file ? 'The file.' : 'Done.';
      op.responses[status] = response;
    }
  }
}
