// `npm run api:schemas -w backend`: what each route answers, as JSON Schema, for the OpenAPI document
// (src/core/openapi.ts). Read from the controllers' own declared return types — the types the code is checked
// against, from common/src/api and the features — by ts-json-schema-generator, so the description cannot
// drift from the code without `src/core/api-schemas.spec.ts` failing. Writes src/core/api-schemas.json:
//   operations: { "<Controller>_<method>": { schema } | { file: true } | { empty: true } },
//   definitions: the named types they use.
import { readdirSync, rmSync, writeFileSync } from 'node:fs';
import { dirname, join, relative } from 'node:path';
import { fileURLToPath } from 'node:url';
import ts from 'typescript';
import { z } from 'zod';
import { AnyType, DefinitionType, LiteralType, SchemaGenerator, createFormatter, createParser, createProgram } from 'ts-json-schema-generator';
import * as format from '../../common/dist/sheet/sheet-format.js';

const BACKEND = join(dirname(fileURLToPath(import.meta.url)), '..');
const SRC = join(BACKEND, 'src');
const ROUTE_DECORATORS = new Set(['Get', 'Post', 'Put', 'Patch', 'Delete']);
/** The files of aliases written for the generator, and removed after it. */
const ALIASES = 'api-schemas.generated';

function controllerFiles(dir) {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) =>
    e.isDirectory() ? controllerFiles(join(dir, e.name)) : e.name.endsWith('.controller.ts') ? [join(dir, e.name)] : [],
  );
}

/**
 * Every route handler: its controller, method and the type of its JSON answer — the declared return type,
 * Promise unwrapped, or the type a `@answers <Type>` line of its doc comment names (a handler that streams
 * JSON it did not parse), or `@answers file` (a download written to the response). `void` answers nothing.
 */
function routeHandlers(files) {
  const out = [];
  const untyped = [];
  for (const file of files) {
    const source = ts.createSourceFile(file, ts.sys.readFile(file), ts.ScriptTarget.Latest, true);
    const imports = source.statements.filter(ts.isImportDeclaration).map((d) => d.getText(source));
    source.forEachChild((node) => {
      if (!ts.isClassDeclaration(node) || !node.name) return;
      for (const member of node.members) {
        if (!ts.isMethodDeclaration(member) || !member.name || !ts.isIdentifier(member.name)) continue;
        const decorators = ts.getDecorators(member) ?? [];
        const route = decorators.some((d) => ts.isCallExpression(d.expression) && ROUTE_DECORATORS.has(d.expression.expression.getText(source)));
        if (!route) continue;
        const where = `${relative(BACKEND, file)}: ${node.name.text}.${member.name.text}`;
        const named = ts
          .getJSDocTags(member)
          .find((t) => t.tagName.text === 'answers')
          ?.comment?.toString()
          .trim();
        let type = member.type;
        if (!type && !named) {
          untyped.push(where);
          continue;
        }
        if (type && ts.isTypeReferenceNode(type) && type.typeName.getText(source) === 'Promise') type = type.typeArguments[0];
        out.push({ file, imports, controller: node.name.text, method: member.name.text, returns: named ?? type.getText(source), answers: !!named });
      }
    });
  }
  if (untyped.length) throw new Error(`routes without a declared return type (the API's description is read from it):\n  ${untyped.join('\n  ')}`);
  return out;
}

/**
 * The sheet format's types are inferred from its zod schemas (common/src/sheet/sheet-format.ts), which the
 * generator cannot read: each is described from the schema itself (zod's own JSON Schema, as OpenAPI 3.0),
 * the rules the server validates with. A cell's `fields` (FieldsOf<kind>) is its kind's schema without `kind`.
 */
const FORMAT_TYPES = {
  SheetFile: format.sheetFileSchema,
  SheetSettings: format.settingsSchema,
  Cell: format.cellSchema,
  NoteCell: format.noteCellSchema,
  CalcCell: format.calcCellSchema,
  CheckCell: format.checkCellSchema,
  SweepCell: format.sweepCellSchema,
  TransientCell: format.transientCellSchema,
  TableCell: format.tableCellSchema,
  FigureCell: format.figureCellSchema,
  NetworkCell: format.networkCellSchema,
  NetworkElementRow: format.networkElementSchema,
};
const KIND_SCHEMAS = Object.fromEntries(format.cellSchema.options.map((o) => [o.shape.kind.value, o]));
const fieldsName = (kind) => `CellFields_${kind}`;

const toJsonSchema = (schema) => {
  const json = z.toJSONSchema(schema, { unrepresentable: 'any', io: 'output', target: 'openapi-3.0' });
  delete json.$schema;
  return json;
};

function sheetFormatDefinitions() {
  const out = {};
  for (const [name, schema] of Object.entries(FORMAT_TYPES)) out[name] = toJsonSchema(schema);
  for (const [kind, schema] of Object.entries(KIND_SCHEMAS)) {
    const json = toJsonSchema(schema);
    delete json.properties.kind;
    json.required = (json.required ?? []).filter((r) => r !== 'kind');
    out[fieldsName(kind)] = { description: `The fields of a ${kind} cell, as in the sheet file.`, ...json };
  }
  out.CellFields = {
    description: "A cell's fields, as in the sheet file (by its kind).",
    oneOf: Object.keys(KIND_SCHEMAS).map((k) => ({ $ref: `#/definitions/${fieldsName(k)}` })),
  };
  return out;
}

class SheetFormatParser {
  supportsNode(node) {
    if (!ts.isTypeReferenceNode(node)) return false;
    const name = node.typeName.getText();
    return name in FORMAT_TYPES || name === 'FieldsOf';
  }
  createType(node, context) {
    const name = node.typeName.getText();
    if (name !== 'FieldsOf') return new DefinitionType(name, new AnyType());
    // FieldsOf<'calc'>, or FieldsOf<K> with K given by the type that uses it.
    const arg = node.typeArguments[0];
    let kind;
    if (ts.isLiteralTypeNode(arg) && ts.isStringLiteral(arg.literal)) kind = arg.literal.text;
    else if (ts.isTypeReferenceNode(arg)) {
      const given = context.getParameters().includes(arg.typeName.getText()) ? context.getArgument(arg.typeName.getText()) : undefined;
      if (given instanceof LiteralType) kind = String(given.getValue());
    }
    return new DefinitionType(kind in KIND_SCHEMAS ? fieldsName(kind) : 'CellFields', new AnyType());
  }
}

/** The schemas, as one document (the spec compares it with the committed one). */
export function apiSchemas() {
  const handlers = routeHandlers(controllerFiles(SRC));
  const operations = {};
  const byFile = new Map();
  for (const h of handlers) {
    const id = `${h.controller}_${h.method}`;
    if (h.returns === 'file') operations[id] = { file: true };
    else if (h.returns === 'void') operations[id] = { empty: true };
    else if (h.returns === 'StreamableFile')
      throw new Error(`${h.controller}.${h.method} streams an answer: say what with @answers <Type> (JSON) or @answers file`);
    else {
      operations[id] = { schema: { $ref: `#/components/schemas/${id}` } };
      byFile.set(h.file, [...(byFile.get(h.file) ?? []), { id, ...h }]);
    }
  }
  // Beside each controller, a file of one type alias a route, with the controller's own imports in scope.
  const written = [];
  try {
    for (const [file, hs] of byFile) {
      const aliases = join(dirname(file), `${ALIASES}.ts`);
      const imports = hs[0].imports.map((i) => i.replace(/^import (?!type )/, 'import type '));
      // A type named only by @answers, from common's API types.
      const known = (name) => hs[0].imports.some((i) => new RegExp(`\\b${name}\\b`).test(i));
      const extra = [...new Set(hs.filter((h) => h.answers && !known(h.returns)).map((h) => h.returns))];
      if (extra.length) imports.push(`import type { ${extra.join(', ')} } from '@ampwright/common';`);
      writeFileSync(aliases, [...imports, ...hs.map((h) => `export type ${h.id} = ${h.returns};`), ''].join('\n'));
      written.push(aliases);
    }
    const config = {
      path: join(SRC, `**/${ALIASES}.ts`),
      tsconfig: join(BACKEND, 'tsconfig.json'),
      type: '*',
      skipTypeCheck: true,
      expose: 'export',
      topRef: true,
      jsDoc: 'extended',
      additionalProperties: true,
      sortProps: true,
    };
    const program = createProgram(config);
    const parser = createParser(program, config, (p) => p.addNodeParser(new SheetFormatParser()));
    const generator = new SchemaGenerator(program, parser, createFormatter(config), config);
    const schema = generator.createSchema('*');
    const definitions = Object.fromEntries(
      Object.entries({ ...schema.definitions, ...sheetFormatDefinitions() })
        .sort(([a], [b]) => a.localeCompare(b))
        .map(([name, s]) => [name, JSON.parse(JSON.stringify(s).replaceAll('#/definitions/', '#/components/schemas/'))]),
    );
    return { operations: Object.fromEntries(Object.entries(operations).sort(([a], [b]) => a.localeCompare(b))), definitions };
  } finally {
    for (const f of written) rmSync(f, { force: true });
  }
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const out = join(SRC, 'core', 'api-schemas.json');
  const started = Date.now();
  writeFileSync(out, `${JSON.stringify(apiSchemas(), null, 1)}\n`);
  console.log(`wrote ${relative(process.cwd(), out)} in ${((Date.now() - started) / 1000).toFixed(1)} s`);
}
