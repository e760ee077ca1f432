// Three MariaDB nodes as one Galera cluster on loopback (Debian's mariadb-server and galera-4), for
// `npm run cluster` and `npm run cluster:proof`. Each node has its data under .data/cluster/nodeN, its
// own SQL port, Galera group port, incremental-state-transfer port and state-transfer (rsync) port. State
// transfer by rsync runs an rsync daemon as the server's user, so when started by root the daemons run as
// the `mysql` user and their directories belong to it.
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { join } from 'node:path';
import { DATA, settings } from './env.mjs';
import { SetupError, log, requireFreePort, run, startChild, waitFor } from './proc.mjs';

/** `npm run cluster:proof` works in a directory of its own (CLUSTER_DIR), so it never touches the cluster's data. */
export const CLUSTER_DIR = process.env.CLUSTER_DIR ?? join(DATA, 'cluster');
/** Added to every port of the cluster (CLUSTER_PORT_OFFSET), so `npm test` can run the proof beside a running `npm run cluster`. */
export const PORT_OFFSET = Number(process.env.CLUSTER_PORT_OFFSET ?? 0);
export const NODES = [1, 2, 3].map((n) => ({
  n,
  name: `node${n}`,
  dir: join(CLUSTER_DIR, `node${n}`),
  data: join(CLUSTER_DIR, `node${n}`, 'data'),
  socket: join(CLUSTER_DIR, `node${n}`, 'mysqld.sock'),
  pidFile: join(CLUSTER_DIR, `node${n}`, 'mysqld.pid'),
  logFile: join(CLUSTER_DIR, `node${n}`, 'mysqld.err'),
  config: join(CLUSTER_DIR, `node${n}`, 'my.cnf'),
  sqlPort: PORT_OFFSET + 3310 + n,
  groupPort: PORT_OFFSET + 4560 + n,
  istPort: PORT_OFFSET + 4570 + n,
  sstPort: PORT_OFFSET + 4580 + n,
}));
const ADDRESS = `gcomm://${NODES.map((node) => `127.0.0.1:${node.groupPort}`).join(',')}`;

const asRoot = process.getuid?.() === 0;

/** Gives the node's files to the mysql user (when root), so its daemon and its rsync can write them. */
function own(path) {
  if (asRoot) run('chown', ['-R', 'mysql:mysql', path], { failure: `could not give ${path} to the mysql user (it comes with mariadb-server)` });
}

function writeConfig(node) {
  writeFileSync(
    node.config,
    [
      '[mysqld]',
      `datadir=${node.data}`,
      `socket=${node.socket}`,
      `pid-file=${node.pidFile}`,
      `log-error=${node.logFile}`,
      `port=${node.sqlPort}`,
      'bind-address=127.0.0.1',
      `user=${asRoot ? 'mysql' : (process.env.USER ?? 'mysql')}`,
      'skip-name-resolve',
      'character-set-server=utf8mb4',
      'collation-server=utf8mb4_unicode_ci',
      // Statements of many connections on a thread per core, not a thread per connection fighting for two cores.
      'thread_handling=pool-of-threads',
      // What Galera requires: row-based replication, InnoDB, interleaved auto-increment locks.
      'binlog_format=ROW',
      'default_storage_engine=InnoDB',
      'innodb_autoinc_lock_mode=2',
      'innodb_flush_log_at_trx_commit=2',
      // The migrations create triggers (an issued revision is immutable) as the app's user, who has no SUPER
      // privilege; with Galera's replication MariaDB refuses that unless told the creators are trusted.
      'log_bin_trust_function_creators=1',
      'wsrep_on=ON',
      'wsrep_provider=/usr/lib/galera/libgalera_smm.so',
      'wsrep_cluster_name=ampwright',
      `wsrep_cluster_address=${ADDRESS}`,
      `wsrep_node_name=${node.name}`,
      `wsrep_node_address=127.0.0.1:${node.groupPort}`,
      `wsrep_provider_options="gmcast.listen_addr=tcp://127.0.0.1:${node.groupPort};ist.recv_addr=127.0.0.1:${node.istPort};gcache.size=256M"`,
      'wsrep_sst_method=rsync',
      `wsrep_sst_receive_address=127.0.0.1:${node.sstPort}`,
      '',
    ].join('\n'),
  );
}

/** Runs statements on one node with the command-line client; a node that does not answer within `timeoutMs` gives status null. */
export function sql(node, statements, { user = 'root', timeoutMs = 30000 } = {}) {
  return spawnSync('mariadb', [`--defaults-file=${node.config}`, `--socket=${node.socket}`, `-u${user}`, '-N', '-B'], {
    input: Array.isArray(statements) ? statements.join(';\n') + ';\n' : statements,
    encoding: 'utf8',
    stdio: ['pipe', 'pipe', 'pipe'],
    timeout: timeoutMs,
    killSignal: 'SIGKILL',
  });
}

/** The node's own view: whether it answers and is Synced with the cluster (wsrep_local_state 4). */
export function nodeState(node) {
  const r = sql(node, "SHOW STATUS WHERE Variable_name IN ('wsrep_local_state_comment','wsrep_cluster_size','wsrep_ready')", { timeoutMs: 5000 });
  if (r.status !== 0) return { up: false };
  const v = Object.fromEntries(
    r.stdout
      .trim()
      .split('\n')
      .map((l) => l.split('\t')),
  );
  return { up: true, state: v.wsrep_local_state_comment, size: Number(v.wsrep_cluster_size), ready: v.wsrep_ready === 'ON' };
}

export function tailOf(file, lines = 25) {
  if (!existsSync(file)) return '(no log)';
  return readFileSync(file, 'utf8').trim().split('\n').slice(-lines).join('\n');
}

/** The node's saved Galera state: its sequence number and whether it may start the cluster (after a clean stop). */
function grastate(node) {
  const file = join(node.data, 'grastate.dat');
  if (!existsSync(file)) return null;
  const text = readFileSync(file, 'utf8');
  return { seqno: Number(/seqno:\s*(-?\d+)/.exec(text)?.[1] ?? -1), safe: /safe_to_bootstrap:\s*1/.test(text), file, text };
}

function initialise(node) {
  mkdirSync(node.data, { recursive: true });
  writeConfig(node);
  own(node.dir);
  if (existsSync(join(node.data, 'mysql'))) return;
  log(`initialising ${node.name} in ${node.data}`);
  run(
    'mariadb-install-db',
    [
      `--defaults-file=${node.config}`,
      `--datadir=${node.data}`,
      `--user=${asRoot ? 'mysql' : process.env.USER}`,
      '--auth-root-authentication-method=normal',
      '--skip-test-db',
    ],
    { stdio: ['ignore', 'ignore', 'inherit'], failure: `mariadb-install-db failed for ${node.name}; remove ${node.dir} if it is half-made` },
  );
  own(node.dir);
}

/**
 * Starts one node and waits until it is Synced: joining the others, or with `bootstrap` starting a new
 * cluster, or with `position` from where it stopped (so it asks only for the writes it missed).
 */
async function startNode(node, { bootstrap = false, position } = {}) {
  await requireFreePort(node.sqlPort, `${node.name}'s SQL port`);
  log(`starting ${node.name} on 127.0.0.1:${node.sqlPort}${bootstrap ? ' (bootstrapping the cluster)' : position ? ` from position ${position}` : ''}`);
  const args = [`--defaults-file=${node.config}`, ...(bootstrap ? ['--wsrep-new-cluster'] : []), ...(position ? [`--wsrep-start-position=${position}`] : [])];
  const child = startChild('mariadbd', args, { stdio: 'ignore', detached: true });
  node.child = child;
  let exited = false;
  child.once('exit', () => (exited = true));
  await waitFor(
    () => {
      if (exited) throw new SetupError(`${node.name} exited at start-up. Its log:\n${tailOf(node.logFile)}`);
      return nodeState(node).state === 'Synced';
    },
    { timeoutMs: 180000, what: `${node.name} to be Synced`, intervalMs: 250 },
  ).catch((err) => {
    throw new SetupError(`${err.message}. Its log:\n${tailOf(node.logFile)}`);
  });
}

/**
 * The position a node reached before it was killed, read from its InnoDB logs (`mariadbd --wsrep-recover`,
 * what Debian's galera_recovery does before systemd starts a node): started from there, the node asks the
 * others for the writes it missed (incremental state transfer) instead of a full copy.
 */
function recoveredPosition(node) {
  const file = join(node.dir, 'recover.log');
  spawnSync('mariadbd', [`--defaults-file=${node.config}`, '--wsrep-recover', `--log-error=${file}`], {
    stdio: 'ignore',
    timeout: 120000,
    killSignal: 'SIGKILL',
  });
  own(node.dir);
  const m = /WSREP: Recovered position:\s*([0-9a-f-]+:-?\d+)/.exec(existsSync(file) ? readFileSync(file, 'utf8') : '');
  return m?.[1];
}

/** Starts a node again after it was killed, from its recovered position; says which state transfer it rejoined by. */
export async function restartNode(node) {
  await startNode(node, { position: recoveredPosition(node) });
  const joined = existsSync(node.logFile) ? readFileSync(node.logFile, 'utf8') : '';
  // The joiner's log says which transfer it received: the last one of its log.
  const ist = joined.lastIndexOf('IST received');
  const sst = Math.max(joined.lastIndexOf('SST received'), joined.lastIndexOf('SST succeeded'));
  return ist > sst ? 'incremental (IST)' : sst >= 0 ? 'full (SST)' : 'unknown';
}

/**
 * Starts the three nodes: the first run bootstraps node1 and lets the others join by full state transfer
 * (rsync); a later run bootstraps from the node that stopped last (safe_to_bootstrap, else the highest
 * sequence number, as `galera_new_cluster` would be told by hand) and the others rejoin by incremental
 * state transfer.
 */
export async function startCluster() {
  mkdirSync(CLUSTER_DIR, { recursive: true });
  for (const node of NODES) initialise(node);
  const states = NODES.map((node) => ({ node, g: grastate(node) }));
  let first = states.find((s) => s.g?.safe)?.node;
  if (!first) {
    const known = states.filter((s) => s.g && s.g.seqno >= 0).sort((a, b) => b.g.seqno - a.g.seqno);
    first = known[0]?.node ?? NODES[0];
    const g = grastate(first);
    if (g) writeFileSync(g.file, g.text.replace(/safe_to_bootstrap:\s*0/, 'safe_to_bootstrap: 1'));
    if (known.length) log(`no node stopped cleanly last; starting from ${first.name}, the most advanced (seqno ${known[0].g.seqno})`);
  }
  await startNode(first, { bootstrap: true });
  for (const node of NODES) if (node !== first) await startNode(node);
  const user = settings.dbUser;
  // Users and grants replicate through Galera (the mysql tables are InnoDB in MariaDB 10.11), so once is enough.
  const r = sql(first, [
    `CREATE DATABASE IF NOT EXISTS \`${settings.dbName}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`,
    `CREATE USER IF NOT EXISTS '${user}'@'127.0.0.1' IDENTIFIED BY '${settings.dbPassword}'`,
    `GRANT ALL PRIVILEGES ON \`${settings.dbName}\`.* TO '${user}'@'127.0.0.1'`,
    // HAProxy's health check signs in as this user (no password, no rights) to see that the node answers.
    "CREATE USER IF NOT EXISTS 'haproxy_check'@'127.0.0.1'",
  ]);
  if (r.status !== 0) throw new SetupError(`could not create the database and users on the cluster: ${r.stderr.trim()}`);
  return first;
}
