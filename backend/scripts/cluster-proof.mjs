// `npm run cluster:proof`: the cluster of `npm run cluster` (in a directory of its own, .data/cluster-proof,
// made afresh) under load through HAProxy — readers opening sheets, writers each adding note cells to a
// sheet of their own, one save after another — while, in the middle, one Galera node and one app instance
// are killed with SIGKILL; later both are started again (the node from its recovered position, rejoining by
// incremental state transfer). Then every save that was acknowledged is looked for on every node, and the
// nodes are compared with each other. Prints throughput and p95 before, during and after the losses, the
// requests that failed and whether the client retried them, and last:
//   cluster proof: N acknowledged saves, N found on every node, lost 0
// It also checks that the sign-in limit is one count across apps and nodes, and that the demo's package job
// was done once, the same on every node. It exits non-zero when an acknowledged save is missing anywhere,
// the nodes differ, or either check fails.
// PROOF_PHASE_SECONDS (15) sets the length of each of the three phases.
import { join } from 'node:path';
import { rmSync } from 'node:fs';
import { DATA } from './lib/env.mjs';
import { apiClient } from './lib/api.mjs';
import { log, main, stopAll, stopOnSignals, waitFor } from './lib/proc.mjs';

process.env.CLUSTER_DIR = join(DATA, 'cluster-proof');
const PHASE_MS = Number(process.env.PROOF_PHASE_SECONDS ?? 15) * 1000;
const READERS = 10;
const WRITERS = 6;
const RETRIES = 8;
// The whole proof is bounded: past this (the three phases and ten minutes for starting, rejoining and
// comparing) it says where it was and what each node reports, stops everything and fails.
const LIMIT_MS = 3 * PHASE_MS + 10 * 60 * 1000;

stopOnSignals();
main(async () => {
  rmSync(process.env.CLUSTER_DIR, { recursive: true, force: true });
  const { CLUSTER, startClusterStack } = await import('./cluster.mjs');
  const { NODES, nodeState, restartNode, sql, tailOf } = await import('./lib/galera.mjs');
  let step = 'starting the cluster';
  const at = (what) => {
    step = what;
    log(`proof: ${what}`);
  };
  setTimeout(() => {
    log(`error: the proof did not finish within ${LIMIT_MS / 1000} s; it was ${step}. What each node reports:`);
    for (const node of NODES) log(`${node.name}: ${JSON.stringify(nodeState(node))}\n${tailOf(node.logFile, 15)}`);
    stopAll().then(() => process.exit(1));
  }, LIMIT_MS).unref();
  /** A statement's output on a node; throws naming the node when it fails or does not answer. */
  const query = (node, statement) => {
    const r = sql(node, statement);
    if (r.status !== 0) throw new Error(`${node.name}: ${r.error?.message ?? r.stderr.trim()}`);
    return r.stdout.trim();
  };
  const stack = await startClusterStack({ appEnv: { THROTTLE_DEFAULT_PER_ADDRESS: '10000000', LOG_REQUESTS: 'false' } });

  const { call, signIn } = apiClient(`http://127.0.0.1:${CLUSTER.frontPort}/api`);

  const session = await signIn('engineer@northfold.example');
  const project = (await call('GET', '/projects', { session })).data[0];
  const readable = (await call('GET', `/projects/${project.id}/sheets`, { session })).data.map((s) => s.id);
  const writers = [];
  for (let k = 0; k < WRITERS; k++) {
    const created = await call('POST', `/projects/${project.id}/sheets`, { session, body: { number: `P-${k + 1}`, title: `Proof sheet ${k + 1}` } });
    if (created.status !== 201) throw new Error(`could not create a sheet: ${created.status} ${created.data.message}`);
    writers.push({ sheet: created.data.id, version: created.data.version, cells: created.data.cells.length, n: 0 });
  }

  let phase = 'before';
  const stats = {};
  const record = (kind, r) => {
    const s = (stats[phase] ??= { read: [], save: [], failed: 0, acknowledgedAfterRetry: 0, givenUp: 0 });
    if (r.status >= 200 && r.status < 300) s[kind].push(r.ms);
  };
  const acknowledged = [];
  let running = true;

  const reader = async (k) => {
    for (let i = k; running; i++) record('read', await call('GET', `/sheets/${readable[i % readable.length]}`, { session }));
  };
  /** One save: a note cell added at the end. A failure (no answer, a 5xx) is tried again with the same version, so it is applied once at most. */
  const save = async (w) => {
    const text = `proof ${w.sheet.slice(0, 8)} #${++w.n}`;
    for (let attempt = 0; attempt <= RETRIES; attempt++) {
      const r = await call('POST', `/sheets/${w.sheet}/cells`, { session, body: { version: w.version, position: w.cells, cell: { kind: 'note', text } } });
      record('save', r);
      if (r.status === 201 || r.status === 200) {
        w.version = r.data.version;
        w.cells++;
        acknowledged.push({ sheet: w.sheet, text });
        if (attempt > 0) stats[phase].acknowledgedAfterRetry++;
        return;
      }
      stats[phase].failed++;
      // Stale: the earlier attempt may have been stored after all (its answer lost). Look before trying again.
      const now = await call('GET', `/sheets/${w.sheet}`, { session });
      if (now.status === 200) {
        w.version = now.data.version;
        w.cells = now.data.cells.length;
        if (now.data.cells.some((c) => c.fields.text === text)) {
          acknowledged.push({ sheet: w.sheet, text });
          return;
        }
      }
      await new Promise((resolve) => setTimeout(resolve, 200 * (attempt + 1)));
    }
    stats[phase].givenUp++;
    log(`a save was given up after ${RETRIES} retries: ${text}`);
  };
  const writer = async (w) => {
    while (running) await save(w);
  };

  log(`proof: ${READERS} readers and ${WRITERS} writers through HAProxy, three phases of ${PHASE_MS / 1000} s`);
  const load = [...Array.from({ length: READERS }, (_, k) => reader(k)), ...writers.map(writer)];
  const wait = (ms) => new Promise((resolve) => setTimeout(resolve, ms));
  at('phase "before"');
  await wait(PHASE_MS);
  phase = 'during';
  const writing = NODES[0];
  log(`killing ${writing.name} (the writing node) and app1 with SIGKILL`);
  writing.child.kill('SIGKILL');
  stack.apps[0].kill('SIGKILL');
  await wait(PHASE_MS);
  phase = 'after';
  at(`restarting ${writing.name} and app1`);
  const transfer = await restartNode(writing);
  await stack.startApp(0);
  log(`${writing.name} rejoined by ${transfer} state transfer; app1 started again`);
  at('phase "after"');
  await wait(PHASE_MS);
  running = false;
  at('waiting for the last requests of the load');
  await Promise.all(load);

  // The sign-in limit is one count whichever app and node take the attempts: they go to the apps in turn,
  // straight to their ports (HAProxy sends one path to one app), and five wrong passwords for an account use
  // up its five a minute, so the sixth is refused.
  at('checking the sign-in limit');
  const apps = CLUSTER.appPorts.map((port) => apiClient(`http://127.0.0.1:${port}/api`).call);
  const attempts = [];
  for (let k = 0; k < 6; k++)
    attempts.push((await apps[k % apps.length]('POST', '/auth/login', { body: { email: 'checker@northfold.example', password: 'not the password' } })).status);
  const limitExact = attempts.slice(0, 5).every((status) => status === 401) && attempts[5] === 429;

  // Every node in sync, then each asked for every acknowledged save, and for a checksum of the tables.
  at('waiting for every node to be Synced');
  // A node that has just rejoined may still be applying what it received; on a slow machine that takes a while.
  await waitFor(() => NODES.every((node) => nodeState(node).state === 'Synced'), {
    timeoutMs: 300000,
    intervalMs: 250,
    what: () => `every node to be Synced (${NODES.map((node) => `${node.name}: ${nodeState(node).state ?? 'no answer'}`).join(', ')})`,
  });
  at('comparing the nodes');
  const held = NODES.map(
    (node) =>
      new Set(
        query(node, "SELECT sheet_id, JSON_UNQUOTE(JSON_EXTRACT(fields, '$.text')) FROM ampwright.cell WHERE kind = 'note'")
          .split('\n')
          .map((line) => line.replace('\t', '|')),
      ),
  );
  const sums = NODES.map((node) =>
    query(node, 'CHECKSUM TABLE ampwright.cell, ampwright.sheet, ampwright.session, ampwright.throttle_counter, ampwright.package_job').replace(/\s+/g, ' '),
  );
  // The demo's issued package was made by one app's worker, claimed once (a conditional UPDATE), on every node.
  const jobs = NODES.map((node) => query(node, "SELECT COUNT(*), SUM(status = 'done') FROM ampwright.package_job"));
  const jobsDone = jobs.every((j) => j === jobs[0] && /^(\d+)\t\1$/.test(j) && !j.startsWith('0\t'));
  const found = acknowledged.filter((a) => held.every((set) => set.has(`${a.sheet}|${a.text}`))).length;
  const lost = acknowledged.length - found;
  const same = sums.every((s) => s === sums[0]);

  const p95 = (xs) => (xs.length ? [...xs].sort((a, b) => a - b)[Math.ceil(0.95 * xs.length) - 1].toFixed(0) : '—');
  for (const name of ['before', 'during', 'after']) {
    const s = stats[name] ?? { read: [], save: [], failed: 0, acknowledgedAfterRetry: 0, givenUp: 0 };
    process.stdout.write(
      `${name.padEnd(7)} reads ${(s.read.length / (PHASE_MS / 1000)).toFixed(0).padStart(4)}/s p95 ${p95(s.read).padStart(5)} ms | ` +
        `saves ${(s.save.length / (PHASE_MS / 1000)).toFixed(0).padStart(4)}/s p95 ${p95(s.save).padStart(5)} ms | ` +
        `failed save requests ${s.failed} (each retried by the client), saves acknowledged after a retry ${s.acknowledgedAfterRetry}, given up ${s.givenUp}\n`,
    );
  }
  process.stdout.write(`nodes ${same ? 'agree' : 'DIFFER'}: ${sums.join(' / ')}\n`);
  process.stdout.write(`sign-in limit across apps and nodes: ${attempts.join(', ')} — ${limitExact ? 'exact' : 'NOT exact'}\n`);
  process.stdout.write(
    `package jobs (count, done) on each node: ${jobs.map((j) => j.replace('\t', ', ')).join(' / ')} — ${jobsDone ? 'all done, the same everywhere' : 'NOT all done'}\n`,
  );
  process.stdout.write(`cluster proof: ${acknowledged.length} acknowledged saves, ${found} found on every node, lost ${lost}\n`);
  return lost === 0 && same && acknowledged.length > 0 && limitExact && jobsDone ? 0 : 1;
});
