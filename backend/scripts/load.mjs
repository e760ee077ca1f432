// `npm run load`: 50 concurrent users against a private copy of the app on loopback for 60 s —
// 35 reading sheets, 15 saving a cell of their own 100-cell sheet (each save re-evaluates it) — and
// prints throughput, p50/p95/p99 latency and errors for each, against the goals (no errors; reads
// p95 < 100 ms; saves p95 < 250 ms). LOAD_SECONDS shortens or lengthens the run.
import autocannon from 'autocannon';
import { rmSync } from 'node:fs';
import { join } from 'node:path';
import { DATA, appEnvironment } from './lib/env.mjs';
import { log, main, stopOnSignals } from './lib/proc.mjs';

const PORT = Number(process.env.LOAD_APP_PORT ?? 3200);
const BASE = `http://127.0.0.1:${PORT}`;
const SECONDS = Number(process.env.LOAD_SECONDS ?? 60);
const READERS = 35;
const statuses = new Map();
const WRITERS = 15;

async function json(path, { method = 'GET', body, session } = {}) {
  const res = await fetch(`${BASE}/api${path}`, {
    method,
    headers: { 'content-type': 'application/json', 'x-ampwright-csrf': session?.csrf ?? '1', ...(session ? { cookie: session.cookie } : {}) },
    body: body ? JSON.stringify(body) : undefined,
  });
  const data = await res.json().catch(() => ({}));
  if (!res.ok) throw new Error(`${method} ${path}: ${res.status} ${data.message ?? ''}`);
  return { data, res };
}

async function signIn(email) {
  const { data, res } = await json('/auth/login', { method: 'POST', body: { email, password: 'Ampwright-demo-1' } });
  return { cookie: res.headers.get('set-cookie').split(';')[0], csrf: data.csrfToken };
}

function sheetOf100(k) {
  const cells = [];
  for (let c = 0; c < 50; c++) {
    cells.push({ kind: 'calc', source: `R_${c} = ${c + 1} ohm\nX_${c} = ${2 * c + 1} ohm\nZ_${c} = sqrt(R_${c}^2 + X_${c}^2)\nI_${c} = 230 V / Z_${c} to A` });
    cells.push({ kind: 'check', condition: `I_${c} <= 300 A`, basis: 'load test' });
  }
  return { format: 'ampwright.sheet/1', title: `Load sheet ${k}`, cells };
}

function report(name, r, goalMs) {
  const p = r.latency;
  const errors = r.errors + r.timeouts + r.non2xx;
  const ok = errors === 0 && p.p97_5 !== undefined && p.p99 !== undefined;
  process.stdout.write(
    `${name.padEnd(7)} ${String(r.requests.total).padStart(6)} requests, ${r.requests.average.toFixed(0).padStart(5)} req/s | p50 ${p.p50} ms, p95 ${percentile(r, 95)} ms, p99 ${p.p99} ms | errors ${errors} (non-2xx ${r.non2xx}, timeouts ${r.timeouts}) | goal p95 < ${goalMs} ms: ${ok && percentile(r, 95) < goalMs ? 'met' : 'NOT met'}\n`,
  );
}

// autocannon reports p90 and p97.5; p95 is read from its histogram.
const percentile = (r, q) => r.histogram?.getValueAtPercentile?.(q) ?? r.latency[`p${q}`] ?? r.latency.p97_5;

stopOnSignals();
main(async () => {
  const { ensureNodeModules, buildAll, ensureDatabase, migrateAndSeed, startApp, startFakes, startMariadb } = await import('./lib/provision.mjs');
  ensureNodeModules();
  await startMariadb();
  ensureDatabase('ampwright_load', { recreate: true });
  const s3Dir = join(DATA, 'load-s3');
  rmSync(s3Dir, { recursive: true, force: true });
  await startFakes({ smtpPort: 2625, mailApiPort: 2680, s3Port: 4670, s3Dir });
  buildAll();
  const env = {
    ...appEnvironment({ dbName: 'ampwright_load', appPort: PORT, smtpPort: 2625, s3Port: 4670 }),
    THROTTLE_DEFAULT_PER_ADDRESS: '100000000',
    LOG_REQUESTS: 'false',
  };
  migrateAndSeed(env);
  await startApp(env);

  log('preparing: two engineers signed in, one 100-cell sheet per writer');
  const sessions = [await signIn('engineer@northfold.example'), await signIn('engineer2@northfold.example')];
  const project = (await json('/projects', { session: sessions[0] })).data[0];
  const readSheets = (await json(`/projects/${project.id}/sheets`, { session: sessions[0] })).data.map((s) => s.id);
  const writers = [];
  for (let k = 0; k < WRITERS; k++) {
    const session = sessions[k % 2];
    const sheet = (await json(`/projects/${project.id}/sheets`, { method: 'POST', session, body: { number: `L-${k + 1}`, sheet: sheetOf100(k) } })).data;
    writers.push({ session, sheetId: sheet.id, cellId: sheet.cells[0].id, version: sheet.version, n: 0 });
  }

  log(`running ${READERS} readers and ${WRITERS} writers for ${SECONDS} s against ${BASE}`);
  let readerIndex = 0;
  const reads = autocannon({
    url: BASE,
    connections: READERS,
    duration: SECONDS,
    requests: [{ method: 'GET', setupRequest: (req) => ({ ...req, path: `/api/sheets/${readSheets[readerIndex++ % readSheets.length]}`, headers: { cookie: sessions[readerIndex % 2].cookie } }) }],
  });
  // Each writer's sheet is saved by one request at a time (taken from a free list, given back on the
  // answer), so every save is based on the version that writer last saw: a 409 would be a real conflict.
  const free = [...writers];
  const saves = autocannon({
    url: BASE,
    connections: WRITERS,
    duration: SECONDS,
    requests: [
      {
        method: 'PATCH',
        setupRequest: (req, context) => {
          const w = free.shift();
          context.w = w;
          w.n += 1;
          return {
            ...req,
            path: `/api/sheets/${w.sheetId}/cells/${w.cellId}`,
            headers: { cookie: w.session.cookie, 'x-ampwright-csrf': w.session.csrf, 'content-type': 'application/json' },
            body: JSON.stringify({ version: w.version, cell: { kind: 'calc', source: `R_0 = ${1 + (w.n % 50)} ohm\nX_0 = 1 ohm\nZ_0 = sqrt(R_0^2 + X_0^2)\nI_0 = 230 V / Z_0 to A` } }),
          };
        },
        onResponse: (status, body, context) => {
          if (status === 200) context.w.version = JSON.parse(body).version;
          else statuses.set(status, (statuses.get(status) ?? 0) + 1);
          free.push(context.w);
        },
      },
    ],
  });
  const [r, w] = await Promise.all([reads, saves]);
  process.stdout.write(`\nLoad: ${READERS + WRITERS} users for ${SECONDS} s on ${BASE} (${new Date().toISOString().slice(0, 10)})\n`);
  report('reads', r, 100);
  report('saves', w, 250);
  if (statuses.size) process.stdout.write(`saves answered other than 200: ${[...statuses].map(([k, v]) => `${v} × ${k}`).join(', ')}\n`);
  return 0;
});
