// The Galera node checks HAProxy asks, one port a node (`npm run cluster` starts this as a process of its
// own, so the scripts' synchronous steps never stall it): 200 when the node is Synced with the cluster and
// ready for queries, 503 otherwise — a node that answers its port while it still receives state must not
// be sent queries (common practice with Galera behind a proxy, as Percona's clustercheck does).
// Arguments: port=config-file=socket for each node.
import { createServer } from 'node:http';
import { spawn } from 'node:child_process';

for (const arg of process.argv.slice(2)) {
  const [port, config, socket] = arg.split('=');
  createServer((_req, res) => {
    const q = spawn('mariadb', [`--defaults-file=${config}`, `--socket=${socket}`, '-uroot', '-N', '-B', '-e', "SHOW STATUS LIKE 'wsrep_local_state'"], {
      timeout: 2000,
      killSignal: 'SIGKILL',
    });
    let out = '';
    q.stdout.on('data', (d) => (out += d));
    q.on('error', () => res.writeHead(503).end('no client\n'));
    q.on('close', (code) => {
      const synced = code === 0 && /\t4\s*$/.test(out);
      res.writeHead(synced ? 200 : 503, { 'content-type': 'text/plain' }).end(synced ? 'synced\n' : 'not synced\n');
    });
  }).listen(Number(port), '127.0.0.1');
}
