import { join } from 'node:path';
import type { Batch, SimulatorStep } from '@tareline/protocol';
import { parse } from 'csv-parse/sync';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { artifactsDir, launchBrowser } from './support/browser';
import { driveSimulator, LONG, quickBenchEnv } from './support/bench';
import { startBuiltHub, type HubProcess } from './support/hub-process';

// Demo shop (README): Ilse Varga is the lead; Joss Whitcombe pours at bench-1 with badge HR-1003.
const LEAD = { email: 'ilse.varga@hollin-ridge.example', password: 'ridge-lead-demo' };

async function call<T>(hub: HubProcess, path: string, token: string, body?: unknown) {
  const response = await fetch(`${hub.url}/api${path}`, {
    method: body === undefined ? 'GET' : 'POST',
    headers: { 'Content-Type': 'application/json', Authorization: `Bearer ${token}` },
    ...(body === undefined ? {} : { body: JSON.stringify(body) }),
  });
  return { status: response.status, body: (await response.json()) as T };
}

/** Asks again until `check` holds: the hub judges readings as the simulated balance prints them. */
async function until<T>(what: string, get: () => Promise<T>, check: (v: T) => boolean) {
  const deadline = Date.now() + 45_000;
  for (;;) {
    const value = await get();
    if (check(value)) return value;
    if (Date.now() > deadline) throw new Error(`${what}: still ${JSON.stringify(value)}`);
    await new Promise((r) => setTimeout(r, 300));
  }
}

async function simulate(hub: HubProcess, steps: SimulatorStep[]) {
  const response = await driveSimulator(hub.url, steps);
  expect(response.status, await response.clone().text()).toBeLessThan(300);
}

describe("the lead's desk, in Chromium", () => {
  let hub: HubProcess;
  let browser: Awaited<ReturnType<typeof launchBrowser>>;
  let noGoId: number;
  let abandonedId: number;

  beforeAll(async () => {
    hub = await startBuiltHub(quickBenchEnv(31));
    browser = await launchBrowser();

    // At the bench, through the API: one batch abandoned, one saved NO-GO (part B far over).
    const badge = await fetch(`${hub.url}/api/auth/badge`, {
      method: 'POST',
      headers: { 'Content-Type': 'application/json' },
      body: JSON.stringify({ benchId: 'bench-1', badge: 'HR-1003' }),
    });
    const { token } = (await badge.json()) as { token: string };
    const materials = await call<{ id: string; name: string }[]>(hub, '/materials', token);
    const lr27 = materials.body.find((m) => m.name.includes('LR-27'))!;
    const start = async () =>
      (
        await call<Batch>(hub, '/batches', token, {
          benchId: 'bench-1',
          materialId: lr27.id,
          totalMassG: 127,
          lots: [
            { part: 0, code: 'LR27R-2604' },
            { part: 1, code: 'LR27H-2602' },
          ],
        })
      ).body;
    const first = await start();
    abandonedId = first.id;
    await call(hub, `/batches/${first.id}/abandon`, token, { reason: 'Wrong cup size' });

    const batch = await start();
    noGoId = batch.id;
    const get = () => call<Batch>(hub, `/batches/${batch.id}`, token).then((r) => r.body);
    await simulate(hub, [{ do: 'place-cup', massG: 40 }, { do: 'settle' }]);
    await until(
      'tare for part A',
      () => call(hub, `/batches/${batch.id}/tare`, token, {}),
      (r) => r.status < 300,
    );
    await until('tared', get, (b) => b.active?.tared === true);
    await simulate(hub, [{ do: 'pour', grams: 100, rateGPerS: 25 }, { do: 'settle' }]);
    await until(
      'part A done',
      () => call(hub, `/batches/${batch.id}/next`, token, {}),
      (r) => r.status < 300,
    );
    await until('part B tared', get, (b) => b.active?.part === 1 && b.active.tared);
    // 35 g where 27 g is wanted: far outside ±1 %.
    await simulate(hub, [{ do: 'pour', grams: 35, rateGPerS: 25 }, { do: 'settle' }]);
    await until(
      'saved NO-GO',
      () => call(hub, `/batches/${batch.id}/save-no-go`, token, {}),
      (r) => r.status < 300,
    );
    expect(await get()).toMatchObject({ state: 'saved', verdict: 'NO-GO' });
  }, 240_000);

  afterAll(async () => {
    await browser?.close();
    await hub?.stop();
  });

  it('finds the NO-GO batch by filter, holds it with a signed reason, exports the filtered CSV', async () => {
    const page = await browser.context.newPage();
    await page.goto(`${hub.url}/review/batches`);
    await page.getByLabel('E-mail').fill(LEAD.email);
    await page.getByLabel('Password').fill(LEAD.password);
    await page.getByRole('button', { name: 'Sign in' }).click();

    const table = page.getByRole('table');
    await table.getByRole('link', { name: String(abandonedId), exact: true }).waitFor(LONG);
    await page.getByLabel('Verdict').selectOption('NO-GO');
    await table
      .getByRole('link', { name: String(abandonedId), exact: true })
      .waitFor({ state: 'detached', ...LONG });
    expect(new URL(page.url()).searchParams.get('verdict')).toBe('NO-GO');
    const row = table.getByRole('row').filter({ hasText: 'NO-GO' });
    expect(await row.count()).toBe(1);
    expect(await row.textContent()).toContain('to decide');

    await table.getByRole('link', { name: String(noGoId), exact: true }).click();
    await page.getByRole('heading', { name: `Batch ${noGoId}` }).waitFor(LONG);
    const panel = page.getByRole('region', { name: 'Decision' });
    await panel.getByLabel('Decision').selectOption('hold');
    await panel.getByLabel(/^Reason/).fill('Part B 8 g over: kept aside for the quality check');
    // A wrong password signs nothing.
    await panel.getByLabel('Your password').fill('not-my-password');
    await panel.getByRole('button', { name: 'Sign decision' }).click();
    await panel.getByRole('alert').waitFor(LONG);
    await panel.getByLabel('Your password').fill(LEAD.password);
    await panel.getByRole('button', { name: 'Sign decision' }).click();
    const history = panel.getByRole('list', { name: 'Decisions' });
    await history.waitFor(LONG);
    expect(await history.textContent()).toContain(
      'On hold by Ilse Varga: Part B 8 g over: kept aside for the quality check',
    );
    await page
      .getByRole('region', { name: 'Audit trail' })
      .getByText(/hold/i)
      .first()
      .waitFor(LONG);
    // The chart is drawn (uPlot's canvas, loaded on demand).
    await page.locator('figure canvas').first().waitFor(LONG);
    await page.screenshot({ path: join(artifactsDir, 'desk-batch-held.png'), fullPage: true });

    // Back to the list: the held NO-GO batches, and their CSV.
    await page.goto(`${hub.url}/review/batches?verdict=NO-GO&disposition=hold`);
    await table.getByRole('link', { name: String(noGoId), exact: true }).waitFor(LONG);
    const href = await page.getByRole('link', { name: 'Export CSV' }).getAttribute('href');
    expect(href).toBe('/api/batches/export.csv?verdict=NO-GO&disposition=hold');
    const token = await page.evaluate(
      () =>
        (JSON.parse(localStorage.getItem('tareline.session') ?? '{}') as { token?: string }).token,
    );
    // The hub takes the token in a header only: a link followed without it is refused.
    expect((await fetch(`${hub.url}${href}`)).status).toBe(401);
    const csv = await fetch(`${hub.url}${href}`, { headers: { Authorization: `Bearer ${token}` } });
    expect(csv.headers.get('content-type')).toMatch(/^text\/csv/);
    const rows = parse(await csv.text(), { columns: true }) as Record<string, string>[];
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({
      number: String(noGoId),
      verdict: 'NO-GO',
      disposition: 'hold',
      state: 'saved',
    });

    // And the page's own button downloads the same file.
    const download = page.waitForEvent('download');
    await page.getByRole('link', { name: 'Export CSV' }).click();
    expect((await download).suggestedFilename()).toMatch(/^batches-.*\.csv$/);
  }, 180_000);
});
