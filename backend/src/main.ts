import 'reflect-metadata';
import { Logger } from '@nestjs/common';
import { createApp } from './bootstrap';
import { environment } from './config/environment';

async function main() {
  const app = await createApp();
  const { APP_HOST: host, APP_PORT: port } = environment();
  await app.listen(port, host);
  new Logger('Ampwright').log(`listening on http://${host}:${port}`);
}

main().catch((err: Error) => {
  console.error(err.message);
  process.exit(1);
});
