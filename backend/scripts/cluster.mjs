// `npm run cluster`: Ampwright on one machine as it would run on several, all on loopback — three MariaDB
// nodes as one Galera cluster (.data/cluster/, ports 3311–3313), HAProxy in front of them on 3310 (one node
// takes the writes, the others stand by), two app instances (3001, 3002) that reach the database through
// it, and HAProxy in front of the apps on http://127.0.0.1:3000, checking each app's readiness. Ctrl-C stops
// it all cleanly; a second run keeps the data. See the README, "Running on a cluster".
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { ROOT, appEnvironment, settings } from './lib/env.mjs';
import { CLUSTER_DIR, NODES, PORT_OFFSET, startCluster } from './lib/galera.mjs';
import { log, main, requireFreePort, startChild, stopOnSignals, waitFor } from './lib/proc.mjs';

export const CLUSTER = {
  dbPort: PORT_OFFSET + 3310,
  appPorts: [PORT_OFFSET + 3001, PORT_OFFSET + 3002],
  frontPort: PORT_OFFSET + 3000,
  checkPorts: NODES.map((node) => PORT_OFFSET + 9200 + node.n),
  statsPort: PORT_OFFSET + 8404,
  fakes: { smtpPort: PORT_OFFSET + 1025, mailApiPort: PORT_OFFSET + 1080, s3Port: PORT_OFFSET + 4569 },
};

/** A page's text, or '' when it does not answer (yet). */
const fetchText = (url) =>
  fetch(url).then(
    (res) => (res.ok ? res.text() : ''),
    () => '',
  );

/** The node checks HAProxy asks (galera-check.mjs), in a process of their own. */
function startNodeChecks() {
  startChild(
    process.execPath,
    [join(ROOT, 'backend', 'scripts', 'galera-check.mjs'), ...NODES.map((node, k) => `${CLUSTER.checkPorts[k]}=${node.config}=${node.socket}`)],
    // Detached, like HAProxy: a Ctrl-C reaches the terminal's whole process group, and these must outlive the
    // apps (stopAll stops them in order) or the apps' database connections are cut under them.
    { stdio: ['ignore', 'inherit', 'inherit'], detached: true },
  );
}

function haproxyConfig() {
  const file = join(CLUSTER_DIR, 'haproxy.cfg');
  writeFileSync(
    file,
    [
      'global',
      '  maxconn 4000',
      'defaults',
      '  timeout connect 2s',
      '  timeout client 120s',
      '  timeout server 120s',
      '  timeout check 2s',
      '  log stdout format raw local0 warning',
      '',
      '# The database: one node takes every connection; the others stand by and take over when it fails its',
      '# check. A node back in sync takes the new connections again, and the connections left on the standby',
      '# are closed, so there is one writing node at a time (Galera would certify two, at the price of conflicts).',
      'listen galera',
      `  bind 127.0.0.1:${CLUSTER.dbPort}`,
      '  mode tcp',
      '  option tcpka',
      '  option httpchk GET /',
      ...NODES.map(
        (node, k) =>
          `  server ${node.name} 127.0.0.1:${node.sqlPort} check port ${CLUSTER.checkPorts[k]} inter 1s fall 2 rise 2 on-marked-down shutdown-sessions${k ? ' backup' : ' on-marked-up shutdown-backup-sessions'}`,
      ),
      '',
      '# The apps: either can take any request (they keep no state of their own that a request relies on); one that',
      '# is not ready is left out. Requests are spread by the first three parts of their path (/api/sheets/<id>),',
      "# so a sheet's saves and reads go to one app while it is up: its evaluation process keeps the sheet, so a",
      '# one-cell edit is sent as that cell, and its kept cells answer reads. Consistent hashing moves only the',
      '# sheets of an app that goes away, and the balance factor keeps a hot sheet from loading one app beyond 1.5',
      '# times the average (the rest of its requests go to the next).',
      'listen app',
      `  bind 127.0.0.1:${CLUSTER.frontPort}`,
      '  mode http',
      '  option forwardfor',
      '  option httpchk GET /api/health/ready',
      '  http-check expect status 200',
      '  balance uri depth 3',
      '  hash-type consistent',
      '  hash-balance-factor 150',
      '  retry-on conn-failure empty-response 503',
      '  retries 2',
      '  option redispatch',
      ...CLUSTER.appPorts.map((port, k) => `  server app${k + 1} 127.0.0.1:${port} check inter 1s fall 2 rise 2`),
      '',
      'listen stats',
      `  bind 127.0.0.1:${CLUSTER.statsPort}`,
      '  mode http',
      '  stats enable',
      '  stats uri /',
      '',
    ].join('\n'),
  );
  return file;
}

/** The environment of app instance k, reaching the database through HAProxy. */
export function clusterAppEnvironment(k, extra = {}) {
  return {
    ...appEnvironment({ dbHost: '127.0.0.1', dbPort: CLUSTER.dbPort, dbSocket: '', appPort: CLUSTER.appPorts[k], ...CLUSTER.fakes }),
    ...extra,
    // Both instances behind one proxy on loopback: the client's address comes from X-Forwarded-For.
    TRUST_PROXY: 'loopback',
  };
}

/** Everything `npm run cluster` starts; the apps' processes are returned (the proof kills one). */
export async function startClusterStack({ seed = true, appEnv = {} } = {}) {
  const { ensureDebianPackages, ensureNodeModules, buildAll, migrateAndSeed, startApp, startFakes } = await import('./lib/provision.mjs');
  ensureNodeModules();
  ensureDebianPackages('mariadbd', ['mariadb-server', 'mariadb-client', 'galera-4'], 'the database');
  ensureDebianPackages('haproxy', ['haproxy'], "the cluster's load balancer");
  ensureDebianPackages('rsync', ['rsync'], 'state transfer between Galera nodes');
  buildAll();
  await startCluster();
  startNodeChecks();
  // HAProxy counts a server as up until its first check fails, and a failed first check takes it down at once:
  // started before the checks answer, it would take node1 down, let the migration open on a standby, and close
  // that connection when node1 came back (on-marked-up shutdown-backup-sessions). So the checks answer first.
  await waitFor(async () => (await Promise.all(CLUSTER.checkPorts.map((port) => fetchText(`http://127.0.0.1:${port}/`)))).every((t) => t === 'synced\n'), {
    timeoutMs: 30000,
    what: "each node's check to answer that it is Synced",
  });
  for (const port of [CLUSTER.dbPort, CLUSTER.frontPort, CLUSTER.statsPort]) await requireFreePort(port, 'HAProxy');
  log(`starting HAProxy: database on 127.0.0.1:${CLUSTER.dbPort}, apps on 127.0.0.1:${CLUSTER.frontPort}, its statistics on :${CLUSTER.statsPort}`);
  startChild('haproxy', ['-f', haproxyConfig(), '-db'], { stdio: ['ignore', 'inherit', 'inherit'], detached: true });
  await startFakes({ ...CLUSTER.fakes, s3Dir: join(CLUSTER_DIR, 's3') });
  // HAProxy's own view (its statistics as CSV: proxy, server, …, status in column 17, the last check's result in
  // column 36): every node up by a check that passed (L7OK), not by the state HAProxy assumes at start, so the
  // migration's connection goes to node1 and stays there.
  await waitFor(
    async () => {
      const csv = await fetchText(`http://127.0.0.1:${CLUSTER.statsPort}/;csv`);
      const nodes = csv
        .split('\n')
        .filter((line) => line.startsWith('galera,node'))
        .map((line) => line.split(','));
      return nodes.length === NODES.length && nodes.every((f) => f[17] === 'UP' && f[36] === 'L7OK');
    },
    { timeoutMs: 30000, what: 'HAProxy to see every database node pass its check' },
  );
  migrateAndSeed(clusterAppEnvironment(0, appEnv), { seed });
  const apps = [];
  for (let k = 0; k < CLUSTER.appPorts.length; k++) apps.push(await startApp(clusterAppEnvironment(k, appEnv)));
  await waitFor(async () => (await fetchText(`http://127.0.0.1:${CLUSTER.frontPort}/api/health/ready`)) !== '', {
    timeoutMs: 30000,
    what: 'HAProxy to see an app ready',
  });
  return { apps, startApp: (k) => startApp(clusterAppEnvironment(k, appEnv)) };
}

if (import.meta.url === `file://${process.argv[1]}`) {
  stopOnSignals();
  main(async () => {
    await startClusterStack();
    log(`Ampwright on the cluster: http://127.0.0.1:${CLUSTER.frontPort} (two apps, three Galera nodes; ${settings.dbName} on each). Ctrl-C stops it all.`);
    await new Promise(() => {});
  });
}
