import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestHub, tempDataDir, type TestHub } from './support/test-app.js';

describe('smoke', () => {
  let hub: TestHub;
  let data: Awaited<ReturnType<typeof tempDataDir>>;
  beforeAll(async () => {
    data = await tempDataDir();
    hub = await startTestHub(data.dir);
  });
  afterAll(async () => {
    await hub?.close();
    await data?.remove();
  });
  it('health', async () => {
    const res = await fetch(`${hub.url}/api/health`);
    expect(await res.json()).toMatchObject({ db: { driver: 'postgres', ok: true } });
  });
});
