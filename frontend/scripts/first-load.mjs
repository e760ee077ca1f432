// The first page's JavaScript, as a browser loads it: the module scripts and module preloads that the built
// index.html names, each gzipped (zlib's default level, as servers compress). Prints each file and the total,
// and exits 1 above the budget (FIRST_LOAD_BUDGET_KB, 200 kB). Run after `vite build`: `npm run first-load -w frontend`.
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { gzipSync } from 'node:zlib';

const DIST = join(dirname(fileURLToPath(import.meta.url)), '..', 'dist');
const BUDGET = Number(process.env.FIRST_LOAD_BUDGET_KB ?? 200) * 1000;

const html = readFileSync(join(DIST, 'index.html'), 'utf8');
const files = [
  ...html.matchAll(/<script[^>]*type="module"[^>]*src="([^"]+\.js)"/g),
  ...html.matchAll(/<link[^>]*rel="modulepreload"[^>]*href="([^"]+\.js)"/g),
].map((m) => m[1]);
if (!files.length) {
  console.error('first load: index.html names no module script; was the front end built?');
  process.exit(1);
}
let total = 0;
for (const file of files) {
  const size = gzipSync(readFileSync(join(DIST, file.replace(/^\//, '')))).length;
  total += size;
  console.log(`${(size / 1000).toFixed(1).padStart(8)} kB  ${file}`);
}
const verdict = total <= BUDGET ? 'within' : 'OVER';
console.log(`first load: ${(total / 1000).toFixed(1)} kB of JavaScript (gzip) in ${files.length} files; budget ${BUDGET / 1000} kB: ${verdict}`);
process.exit(total <= BUDGET ? 0 : 1);
