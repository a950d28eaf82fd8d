import 'reflect-metadata';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { INestApplication } from '@nestjs/common';
import { createApp } from '../../src/app.js';
import { loadConfig, type AppConfig } from '../../src/config/app-config.js';

export interface TestHub {
  app: INestApplication;
  config: AppConfig;
  url: string;
  close(): Promise<void>;
}

/** A temporary data folder, removed by the returned function. */
export async function tempDataDir(): Promise<{ dir: string; remove: () => Promise<void> }> {
  const dir = await mkdtemp(join(tmpdir(), 'tareline-test-'));
  return { dir, remove: () => rm(dir, { recursive: true, force: true }) };
}

/** Boots the real hub on a loopback port with its database in `dataDir`. */
export async function startTestHub(
  dataDir: string,
  env: Record<string, string> = {},
): Promise<TestHub> {
  const config = loadConfig({
    PORT: '0',
    HOST: '127.0.0.1',
    LOG_LEVEL: 'silent',
    TARELINE_DATA_DIR: dataDir,
    ...env,
  });
  const app = await createApp(config);
  await app.listen(0, '127.0.0.1');
  const address = app.getHttpServer().address() as { port: number };
  return {
    app,
    config,
    url: `http://127.0.0.1:${address.port}`,
    close: () => app.close(),
  };
}
