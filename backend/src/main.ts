import { Logger } from '@nestjs/common';
import { createApp } from './app.factory';
import { loadConfig } from './config/config.schema';

async function main(): Promise<void> {
  const config = loadConfig();
  const app = await createApp(config);
  await app.listen(config.PORT, config.HOST);
  new Logger('kiln').log(`API listening on http://${config.HOST}:${config.PORT}/api`);
}

main().catch((error: unknown) => {
  console.error(error instanceof Error ? error.message : error);
  process.exit(1);
});
