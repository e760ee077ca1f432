// Local stand-ins for the hosted services, for development and tests only, on loopback:
// - an SMTP sink (smtp-server + mailparser) that keeps messages in memory and serves them on
//   GET http://127.0.0.1:MAIL_API_PORT/messages (DELETE clears them);
// - an S3-compatible object store (s3rver) with its data in S3_DIR.
import { createServer } from 'node:http';
import { SMTPServer } from 'smtp-server';
import { simpleParser } from 'mailparser';
import S3rver from 's3rver';

const smtpPort = Number(process.env.SMTP_PORT ?? 1025);
const apiPort = Number(process.env.MAIL_API_PORT ?? 1080);
const s3Port = Number(process.env.S3_PORT ?? 4569);
const s3Dir = process.env.S3_DIR ?? '.data/s3';

const messages = [];
let nextId = 1;

const smtp = new SMTPServer({
  authOptional: true,
  // Loopback only: no reverse DNS of the client (without a resolver it waits 1.5 s on every message).
  disableReverseLookup: true,
  disabledCommands: ['STARTTLS'],
  logger: false,
  size: 30 * 1024 * 1024,
  onData(stream, session, callback) {
    simpleParser(stream)
      .then((mail) => {
        messages.push({
          id: nextId++,
          receivedAt: new Date().toISOString(),
          from: mail.from?.text ?? '',
          to: session.envelope.rcptTo.map((r) => r.address),
          subject: mail.subject ?? '',
          text: mail.text ?? '',
          html: typeof mail.html === 'string' ? mail.html : '',
        });
        callback();
      })
      .catch(callback);
  },
});

const api = createServer((req, res) => {
  const url = new URL(req.url ?? '/', 'http://127.0.0.1');
  if (url.pathname !== '/messages') {
    res.writeHead(404, { 'content-type': 'application/json' }).end('{"message":"use /messages"}');
    return;
  }
  if (req.method === 'DELETE') {
    messages.length = 0;
    res.writeHead(204).end();
    return;
  }
  const to = url.searchParams.get('to');
  const list = to ? messages.filter((m) => m.to.includes(to.toLowerCase()) || m.to.includes(to)) : messages;
  res.writeHead(200, { 'content-type': 'application/json' }).end(JSON.stringify(list));
});

const s3 = new S3rver({ address: '127.0.0.1', port: s3Port, directory: s3Dir, silent: true });

function listen(server, port, what) {
  return new Promise((resolve, reject) => {
    server.once('error', (err) => reject(new Error(`${what} could not listen on 127.0.0.1:${port}: ${err.message}`)));
    server.listen(port, '127.0.0.1', resolve);
  });
}

try {
  await listen(smtp, smtpPort, 'the SMTP sink');
  await listen(api, apiPort, 'the mail API');
  await s3.run();
} catch (err) {
  process.stderr.write(`[fakes] ${err.message}\n`);
  process.exit(1);
}

function stop() {
  smtp.close(() => {});
  api.close();
  s3.close().finally(() => process.exit(0));
  setTimeout(() => process.exit(0), 3000).unref();
}
process.on('SIGTERM', stop);
process.on('SIGINT', stop);
