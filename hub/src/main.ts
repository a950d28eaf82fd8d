import 'reflect-metadata';
import { Logger } from '@nestjs/common';
import { createApp } from './app.js';
import { ConfigError, loadConfig } from './config/app-config.js';
import { createFilesPrivately, DataDirInUseError } from './database/data-dir.js';

async function bootstrap(): Promise<void> {
  // Before anything writes: the data folder holds hashes and secrets.
  createFilesPrivately();
  const config = loadConfig();
  const app = await createApp(config);
  await app.listen(config.http.port, config.http.host);
  const shownHost = config.http.host === '0.0.0.0' ? 'localhost' : config.http.host;
  const logger = new Logger('Bootstrap');
  logger.log(`Tareline hub ready at http://${shownHost}:${config.http.port}/`);

  // Close the database and ports before leaving, so the data folder is never left half-written.
  let stopping = false;
  const stop = (signal: NodeJS.Signals) => {
    if (stopping) return;
    stopping = true;
    logger.log(`${signal} received: stopping`);
    app.close().then(
      () => process.exit(0),
      (err: unknown) => {
        logger.error(err instanceof Error ? err : String(err));
        process.exit(1);
      },
    );
  };
  process.once('SIGINT', stop);
  process.once('SIGTERM', stop);
}

bootstrap().catch((err: unknown) => {
  if (err instanceof ConfigError || err instanceof DataDirInUseError) {
    process.stderr.write(`${err.message}\n`);
  } else {
    process.stderr.write(`Tareline hub failed to start: ${(err as Error)?.stack ?? String(err)}\n`);
  }
  process.exit(1);
});
