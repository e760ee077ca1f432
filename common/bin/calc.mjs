#!/usr/bin/env node
// `npm run -s calc -- FILE.json`: evaluates a sheet file with the server's engine and prints the
// results as JSON on stdout (PRODUCT.md, "Command-line evaluation"). Exit 0: every cell evaluated and
// every check passed; 1: a cell failed or a check did not pass; 2: the file cannot be read.
import { spawnSync } from 'node:child_process';
import { existsSync, readFileSync, readdirSync, statSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const here = dirname(fileURLToPath(import.meta.url));
const pkg = join(here, '..');
const dist = join(pkg, 'dist', 'index.js');

function newest(dir) {
  let t = 0;
  for (const e of readdirSync(dir, { withFileTypes: true })) {
    const p = join(dir, e.name);
    t = Math.max(t, e.isDirectory() ? newest(p) : statSync(p).mtimeMs);
  }
  return t;
}

// Build the engine first when its output is missing or older than its source (output to stderr only).
if (!existsSync(dist) || statSync(dist).mtimeMs < newest(join(pkg, 'src'))) {
  const tsc = createRequire(import.meta.url).resolve('typescript/bin/tsc');
  const built = spawnSync(process.execPath, [tsc, '-p', join(pkg, 'tsconfig.build.json')], { stdio: ['ignore', 2, 2] });
  if (built.status !== 0) {
    process.stderr.write('calc: the engine failed to build\n');
    process.exit(2);
  }
}

const fail = (message) => {
  process.stderr.write(`calc: ${message}\n`);
  process.exit(2);
};

const file = process.argv[2];
if (!file || process.argv.length > 3) fail('usage: npm run -s calc -- FILE.json');
let text;
try {
  text = readFileSync(file, 'utf8');
} catch (err) {
  fail(`cannot read ${file}: ${err.code === 'ENOENT' ? 'no such file' : err.message}`);
}

const engine = createRequire(import.meta.url)(dist);
const parsed = engine.parseSheetJson(text);
if (!parsed.ok) fail(`${file} is not a valid sheet file:\n${parsed.problems.map((p) => `  ${p.path}: ${p.message}`).join('\n')}`);
const { output, exitCode } = engine.toContractJson(engine.evaluateSheet(parsed.sheet));
// Exit only once stdout has drained: process.exit() right after a large write to a pipe cuts it short.
process.exitCode = exitCode;
process.stdout.write(`${JSON.stringify(output, null, 2)}\n`);
