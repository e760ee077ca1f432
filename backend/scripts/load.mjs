// `npm run load`: 50 concurrent users against a private copy of the app on loopback — 35 reading
// sheets, 15 saving a cell of their own 100-cell sheet (each save re-evaluates it) — and prints
// throughput, p50/p95/p99 latency and errors for each.
//
// 1. Paced, for LOAD_SECONDS (60): each user makes LOAD_RATE (1) requests a second — a reader opening
//    a sheet every second, a writer saving every second as if typing without a stop (the editor saves
//    250 ms after typing pauses). Judged against the goals: no errors; p95 < 100 ms for reads and
//    < 250 ms for saves. autocannon corrects the latencies for coordinated omission at a fixed rate.
// 2. Saturated, for LOAD_SATURATED_SECONDS (15): the same 50 users with no pause at all, to show the
//    capacity of this machine; printed for information, not judged.
// For each phase it also prints where a save's time goes on the server (its Server-Timing header):
// database, evaluation (with the engine's own time inside it) and everything else.
import autocannon from 'autocannon';
import { rmSync } from 'node:fs';
import { createRequire } from 'node:module';
import { cpus } from 'node:os';
import { join } from 'node:path';
import { DATA, appEnvironment } from './lib/env.mjs';
import { log, main, stopOnSignals } from './lib/proc.mjs';
import { apiClient } from './lib/api.mjs';
import { sheetOf100 } from './lib/sheets.mjs';

// autocannon's own histogram decoder, to merge the users' histograms (hdr-histogram-js).
const { decodeHist } = createRequire(import.meta.url)('autocannon/lib/histUtil.js');

const PORT = Number(process.env.LOAD_APP_PORT ?? 3200);
const BASE = `http://127.0.0.1:${PORT}`;
const SECONDS = Number(process.env.LOAD_SECONDS ?? 60);
const RATE = Number(process.env.LOAD_RATE ?? 1);
const READERS = 35;
const statuses = new Map();
/** The saves' Server-Timing figures (db, eval, engine, total in ms), summed for the phase running. */
let saveTimings = { n: 0, db: 0, eval: 0, engine: 0, total: 0 };
const WRITERS = 15;
const NOISY_SECONDS = Number(process.env.LOAD_NOISY_SECONDS ?? 20);
const NOISY_CONNECTIONS = 12;

const { json, signIn } = apiClient(`${BASE}/api`, { timeoutMs: 60000 });

/** A writer's save of its own sheet, based on the version it last saw: a 409 would be a real conflict. */
function saveRequest(w) {
  return {
    method: 'PATCH',
    setupRequest: (req) => {
      w.n += 1;
      return {
        ...req,
        path: `/api/sheets/${w.sheetId}/cells/${w.cellId}`,
        headers: { cookie: w.session.cookie, 'x-ampwright-csrf': w.session.csrf, 'content-type': 'application/json' },
        body: JSON.stringify({
          version: w.version,
          cell: { kind: 'calc', source: `R_0 = ${1 + (w.n % 50)} ohm\nX_0 = 1 ohm\nZ_0 = sqrt(R_0^2 + X_0^2)\nI_0 = 230 V / Z_0 to A` },
        }),
      };
    },
    onResponse: (status, body, _context, headers) => {
      if (status === 200) {
        w.version = JSON.parse(body).version;
        addTimings(headers);
      } else {
        statuses.set(status, (statuses.get(status) ?? 0) + 1);
        // A save of a phase cut off at its end may land after the next phase read the version: take the version
        // the refusal names, as the editor does, rather than be refused for the rest of the phase.
        if (status === 409) w.version = JSON.parse(body)?.current?.version ?? w.version;
      }
    },
  };
}

/** Adds a save's Server-Timing header (`db;dur=1.2, eval;dur=3.4, …`) to the phase's sums. */
function addTimings(headers) {
  const raw = Object.entries(headers ?? {}).find(([k]) => k.toLowerCase() === 'server-timing')?.[1];
  if (!raw) return;
  saveTimings.n += 1;
  for (const part of String(raw).split(',')) {
    const [name, dur] = part.trim().split(';dur=');
    if (name in saveTimings && name !== 'n') saveTimings[name] += Number(dur) || 0;
  }
}

/** How many saves each path has stored so far (the app's ampwright_sheet_saves_total). */
async function savesByPath() {
  const text = await (await fetch(`${BASE}/api/metrics`)).text();
  const count = (path) => Number(new RegExp(`ampwright_sheet_saves_total\\{path="${path}"\\} (\\d+)`).exec(text)?.[1] ?? 0);
  return { oneCell: count('one-cell'), wholeSheet: count('whole-sheet') };
}

/** Where a save's time went on the server, on average, from the phase's Server-Timing sums; and which path the saves took. */
function reportTimings(t) {
  if (!t.n) return;
  const mean = (x) => (x / t.n).toFixed(1);
  const rest = t.total - t.db - t.eval;
  process.stdout.write(
    `a save on the server, mean of ${t.n}: ${mean(t.total)} ms = database ${mean(t.db)} ms + evaluation ${mean(t.eval)} ms (the engine's own ${mean(t.engine)} ms) + everything else ${mean(rest)} ms (HTTP, validation, serialisation)\n`,
  );
  if (t.paths) process.stdout.write(`saves by path: ${t.paths.oneCell} one-cell (the edited cell alone sent), ${t.paths.wholeSheet} whole-sheet\n`);
}

/** One figure for a group of users: their latency histograms merged. */
function summarise(results, seconds) {
  const [all, ...rest] = results.map((r) => decodeHist(r.latencies));
  for (const h of rest) all.add(h);
  const sum = (f) => results.reduce((n, r) => n + f(r), 0);
  const total = sum((r) => r.totalCompletedRequests);
  return {
    total,
    perSecond: total / seconds,
    p50: all.getValueAtPercentile(50),
    p95: all.getValueAtPercentile(95),
    p99: all.getValueAtPercentile(99),
    errors: sum((r) => r.errors + r.timeouts + r.non2xx),
    non2xx: sum((r) => r.non2xx),
    timeouts: sum((r) => r.timeouts),
  };
}

function report(name, r, goalMs) {
  const verdict = goalMs === undefined ? '' : ` | goal p95 < ${goalMs} ms: ${r.errors === 0 && r.p95 < goalMs ? 'met' : 'NOT met'}`;
  process.stdout.write(
    `${name.padEnd(7)} ${String(r.total).padStart(6)} requests, ${r.perSecond.toFixed(0).padStart(5)} req/s | p50 ${r.p50} ms, p95 ${r.p95} ms, p99 ${r.p99} ms | errors ${r.errors} (non-2xx ${r.non2xx}, timeouts ${r.timeouts})${verdict}\n`,
  );
}

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
    THROTTLE_DEFAULT_PER_ADDRESS: '10000000',
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

  /**
   * Readers and writers together; `rate` requests a second per user, 0 for no pause. Each user is
   * its own autocannon instance on one connection, and paced users start spread over the first
   * second, as people do: a load generator firing every user in the same millisecond measures its own
   * bursts. The latency histograms of all users are merged for the figures.
   */
  async function phase(seconds, rate) {
    saveTimings = { n: 0, db: 0, eval: 0, engine: 0, total: 0 };
    const pathsBefore = await savesByPath();
    // The last save of a previous phase may have been cut off before its answer: start from the truth.
    for (const w of writers) w.version = (await json(`/sheets/${w.sheetId}`, { session: w.session })).data.version;
    const pause = (k, n) => new Promise((r) => setTimeout(r, rate > 0 ? (k * 1000) / (n * rate) : 0));
    const user = (requests) =>
      autocannon({ url: BASE, connections: 1, duration: seconds, skipAggregateResult: true, ...(rate > 0 ? { connectionRate: rate } : {}), requests });
    let readerIndex = 0;
    const readers = Array.from({ length: READERS }, async (_, k) => {
      await pause(k, READERS);
      return user([
        {
          method: 'GET',
          setupRequest: (req) => ({
            ...req,
            path: `/api/sheets/${readSheets[readerIndex++ % readSheets.length]}`,
            headers: { cookie: sessions[k % 2].cookie },
          }),
        },
      ]);
    });
    // Each writer saves its own sheet, one request at a time, based on the version it last saw: a 409
    // would be a real conflict.
    const savers = writers.map(async (w, k) => {
      await pause(k, WRITERS);
      return user([saveRequest(w)]);
    });
    const figures = [summarise(await Promise.all(readers), seconds), summarise(await Promise.all(savers), seconds)];
    const paths = await savesByPath();
    return [...figures, { ...saveTimings, paths: { oneCell: paths.oneCell - pathsBefore.oneCell, wholeSheet: paths.wholeSheet - pathsBefore.wholeSheet } }];
  }

  /**
   * Noisy neighbour: another firm sends evaluations that run to the deadline, as fast as it can on
   * NOISY_CONNECTIONS connections, while this firm's writers save at the paced rate. Fair scheduling
   * must keep this firm's save p95 under 500 ms; the noisy firm is told it is busy (429).
   */
  async function noisyPhase(seconds) {
    for (const w of writers) w.version = (await json(`/sheets/${w.sheetId}`, { session: w.session })).data.version;
    // Registered as anyone would: the form, then the link e-mailed to the address (read from the mail sink).
    const email = `noisy-${Date.now()}@load.example`;
    await json('/auth/register', { method: 'POST', body: { firmName: 'Noisy Neighbour Ltd', name: 'Noisy', email, password: 'noisy-neighbour-password' } });
    let token;
    for (let k = 0; k < 100 && !token; k++) {
      const messages = await (await fetch(`http://127.0.0.1:2680/messages?to=${encodeURIComponent(email)}`)).json();
      token = /token=([\w-]+)/.exec(messages.find((m) => m.subject === 'Confirm your Ampwright registration')?.text ?? '')?.[1];
      if (!token) await new Promise((r) => setTimeout(r, 100));
    }
    const registered = await json('/auth/register/confirm', { method: 'POST', body: { token } });
    const noisy = { cookie: registered.res.headers.get('set-cookie').split(';')[0], csrf: registered.data.csrfToken };
    const runaway = {
      format: 'ampwright.sheet/1',
      title: 'Runaway',
      cells: [{ kind: 'calc', source: `M = ones(316, 316)\nP = ${Array.from({ length: 20 }, () => 'M').join(' * ')}` }],
    };
    const noisyStatuses = new Map();
    const flood = autocannon({
      url: BASE,
      connections: NOISY_CONNECTIONS,
      duration: seconds,
      skipAggregateResult: true,
      requests: [
        {
          method: 'POST',
          path: '/api/evaluate',
          headers: { cookie: noisy.cookie, 'x-ampwright-csrf': noisy.csrf, 'content-type': 'application/json' },
          body: JSON.stringify(runaway),
          onResponse: (status) => noisyStatuses.set(status, (noisyStatuses.get(status) ?? 0) + 1),
        },
      ],
    });
    const pause = (k) => new Promise((r) => setTimeout(r, (k * 1000) / WRITERS));
    const savers = writers.map(async (w, k) => {
      await pause(k);
      return autocannon({ url: BASE, connections: 1, duration: seconds, connectionRate: 1, skipAggregateResult: true, requests: [saveRequest(w)] });
    });
    const saves = summarise(await Promise.all(savers), seconds);
    await flood;
    return { saves, noisyStatuses };
  }

  const saturatedSeconds = Number(process.env.LOAD_SATURATED_SECONDS ?? 15);
  log(`paced: ${READERS} readers and ${WRITERS} writers, each ${RATE} request(s) a second, for ${SECONDS} s against ${BASE}`);
  const [r, w, pacedTimings] = await phase(SECONDS, RATE);
  const pacedStatuses = new Map(statuses);
  statuses.clear();
  let saturated = [];
  if (saturatedSeconds > 0) {
    log(`saturated: the same users with no pause, for ${saturatedSeconds} s`);
    saturated = await phase(saturatedSeconds, 0);
  }
  let noisy;
  if (NOISY_SECONDS > 0) {
    log(`noisy neighbour: another firm floods evaluation on ${NOISY_CONNECTIONS} connections while the ${WRITERS} writers save, for ${NOISY_SECONDS} s`);
    statuses.clear();
    noisy = await noisyPhase(NOISY_SECONDS);
  }
  const day = new Date().toISOString().slice(0, 10);
  process.stdout.write(
    `\nLoad, paced: ${READERS + WRITERS} users, each ${RATE} request(s) a second, for ${SECONDS} s on ${BASE} (${day}, ${cpus().length} cores)\n`,
  );
  report('reads', r, 100);
  report('saves', w, 250);
  reportTimings(pacedTimings);
  if (pacedStatuses.size) process.stdout.write(`saves answered other than 200: ${[...pacedStatuses].map(([k, v]) => `${v} × ${k}`).join(', ')}\n`);
  if (saturated.length) {
    process.stdout.write(`\nLoad, saturated (for information): the same users with no pause, for ${saturatedSeconds} s\n`);
    report('reads', saturated[0]);
    report('saves', saturated[1]);
    reportTimings(saturated[2]);
    if (statuses.size) process.stdout.write(`saves answered other than 200: ${[...statuses].map(([k, v]) => `${v} × ${k}`).join(', ')}\n`);
  }
  if (noisy) {
    process.stdout.write(
      `\nLoad, noisy neighbour: another firm sends runaway evaluations on ${NOISY_CONNECTIONS} connections with no pause, for ${NOISY_SECONDS} s\n`,
    );
    report('saves', noisy.saves, 500);
    process.stdout.write(
      `noisy firm's evaluations answered: ${[...noisy.noisyStatuses]
        .sort()
        .map(([k, v]) => `${v} × ${k}`)
        .join(', ')}\n`,
    );
    if (statuses.size) process.stdout.write(`saves answered other than 200: ${[...statuses].map(([k, v]) => `${v} × ${k}`).join(', ')}\n`);
  }
  return 0;
});
