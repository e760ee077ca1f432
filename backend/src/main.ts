import 'reflect-metadata';
import { Logger } from '@nestjs/common';
import { createApp } from './bootstrap';

async function main() {
  const app = await createApp();
  const host = process.env.APP_HOST ?? '127.0.0.1';
  const port = Number(process.env.APP_PORT ?? 3000);
  await app.listen(port, host);
  new Logger('Ampwright').log(`listening on http://${host}:${port}`);
}

main().catch((err: Error) => {
  console.error(err.message);
  process.exit(1);
});
