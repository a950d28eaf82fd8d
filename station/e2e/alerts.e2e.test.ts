import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { artifactsDir, launchBrowser } from './support/browser';
import { startBuiltHub, type HubProcess } from './support/hub-process';

// Demo shop (README): Oda Fenwick is the admin; Joss Whitcombe pours with badge HR-1003, no PIN.
const ADMIN = { email: 'oda.fenwick@hollin-ridge.example', password: 'ridge-admin-demo' };

async function api<T>(
  hub: HubProcess,
  path: string,
  init: { token?: string; body?: unknown } = {},
) {
  const response = await fetch(`${hub.url}/api${path}`, {
    method: init.body === undefined ? 'GET' : 'POST',
    headers: {
      'Content-Type': 'application/json',
      ...(init.token ? { Authorization: `Bearer ${init.token}` } : {}),
    },
    ...(init.body === undefined ? {} : { body: JSON.stringify(init.body) }),
  });
  expect(response.ok, `${path}: ${response.status}`).toBe(true);
  return (await response.json()) as T;
}

describe('alert mails in the local mail catcher, in Chromium', () => {
  let hub: HubProcess;
  let browser: Awaited<ReturnType<typeof launchBrowser>>;

  beforeAll(async () => {
    // No TARELINE_SMTP_URL: the hub runs its own mail catcher.
    hub = await startBuiltHub();
    browser = await launchBrowser();
  });

  afterAll(async () => {
    await browser?.close();
    await hub?.stop();
  });

  it('lets an admin ask for abandoned batches and see the mail the hub caught', async () => {
    const page = await browser.context.newPage();
    await page.goto(`${hub.url}/alerts`);
    await page.getByLabel('E-mail').fill(ADMIN.email);
    await page.getByLabel('Password').fill(ADMIN.password);
    await page.getByRole('button', { name: 'Sign in' }).click();

    const form = page.getByRole('form', { name: 'My alerts' });
    await form.getByRole('checkbox', { name: 'A batch abandoned' }).check();
    await form.getByRole('button', { name: 'Save my alerts' }).click();
    await form.getByRole('status').getByText('Your alerts are saved').waitFor();

    // At the bench: an operator starts a batch and abandons it.
    const { token } = await api<{ token: string }>(hub, '/auth/badge', {
      body: { benchId: 'bench-1', badge: 'HR-1003' },
    });
    const materials = await api<Array<{ id: string; name: string }>>(hub, '/materials', { token });
    const sc14 = materials.find((m) => m.name.includes('SC-14'))!;
    const batch = await api<{ id: number }>(hub, '/batches', {
      token,
      body: {
        benchId: 'bench-1',
        materialId: sc14.id,
        totalMassG: 114,
        lots: [
          { part: 0, code: 'SC14R-2609' },
          { part: 1, code: 'SC14H-2511' },
        ],
      },
    });
    await api(hub, `/batches/${batch.id}/abandon`, { token, body: { reason: 'Cup tipped over' } });

    // The page refreshes the catcher by itself; reloading shows it at once.
    await page.reload();
    const mail = page.getByRole('article', { name: new RegExp(`batch #${batch.id},`) });
    await mail.waitFor();
    expect(await mail.textContent()).toContain('Why abandoned: Cup tipped over');
    const outbox = page.getByRole('table', { name: 'Outbox' });
    await outbox
      .getByRole('row')
      .filter({ hasText: `batch #${batch.id},` })
      .filter({ hasText: 'sent' })
      .waitFor();
    await page.screenshot({ path: join(artifactsDir, 'alerts-caught-mail.png'), fullPage: true });
  });
});
