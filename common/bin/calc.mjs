#!/usr/bin/env node
// `npm run -s calc -- FILE.json`: evaluates a sheet file with the server's engine and prints the
// results as JSON on stdout (PRODUCT.md, "Command-line evaluation"). Exit 0: every cell evaluated and
// every check passed; 1: a cell failed or a check did not pass; 2: the file cannot be read.
// The sheet is evaluated in a child process with a deadline (CALC_TIMEOUT_MS, 10 000) and a heap cap
// (CALC_MEMORY_MB, 512): a sheet that needs more is stopped, and every cell says why (exit 1).
import { fork, spawnSync } from 'node:child_process';
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

const timeoutMs = Number(process.env.CALC_TIMEOUT_MS ?? 10_000);
const memoryMb = Number(process.env.CALC_MEMORY_MB ?? 512);
if (!(timeoutMs > 0) || !(memoryMb >= 32)) fail('CALC_TIMEOUT_MS must be a positive number of milliseconds and CALC_MEMORY_MB at least 32');

const print = ({ output, exitCode }) => {
  // Exit only once stdout has drained: process.exit() right after a large write to a pipe cuts it short.
  process.exitCode = exitCode;
  process.stdout.write(`${JSON.stringify(output, null, 2)}\n`);
};
/** Every cell of the sheet with the reason it was not evaluated (exit 1). */
const notEvaluated = (reason) =>
  print({
    output: {
      cells: parsed.sheet.cells.map((c) => ({
        kind: c.kind,
        status: 'error',
        errors: [{ line: 1, column: 1, message: `Not evaluated: ${reason}` }],
        warnings: [],
      })),
    },
    exitCode: 1,
  });

const child = fork(join(here, 'calc-child.cjs'), [dist], {
  execArgv: [`--max-old-space-size=${memoryMb}`],
  serialization: 'advanced',
  stdio: ['ignore', 'ignore', 'pipe', 'ipc'],
});
let stderr = '';
let answered = false;
let timedOut = false;
child.stderr.on('data', (c) => (stderr = (stderr + c).slice(-4096)));
const timer = setTimeout(() => {
  timedOut = true;
  child.kill('SIGKILL');
}, timeoutMs);
child.on('message', (result) => {
  answered = true;
  clearTimeout(timer);
  if (result.error) notEvaluated(`the evaluation failed: ${result.error}`);
  else print(result);
  child.disconnect();
});
child.on('exit', (code, signal) => {
  clearTimeout(timer);
  if (answered) return;
  if (timedOut)
    notEvaluated(
      `this sheet takes longer than CALC_TIMEOUT_MS allows (${timeoutMs / 1000} s), so it was stopped. Look for a very large sweep, matrix or a runaway expression.`,
    );
  else if (/heap out of memory|Reached heap limit|Allocation failed|Invalid (array|string) length/i.test(stderr))
    notEvaluated(`this sheet needs more memory than CALC_MEMORY_MB allows (${memoryMb} MB), so it was stopped. Look for a very large matrix, sweep or table.`);
  else notEvaluated(`the evaluation stopped unexpectedly (${signal ?? `exit code ${code}`})`);
});
child.send(parsed.sheet);
