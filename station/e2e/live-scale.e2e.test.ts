import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { driveSimulator } from './support/bench';
import { artifactsDir, launchBrowser } from './support/browser';
import { startBuiltHub, type HubProcess } from './support/hub-process';

describe('the live-scale page in Chromium', () => {
  let hub: HubProcess;
  let browser: Awaited<ReturnType<typeof launchBrowser>>;

  beforeAll(async () => {
    hub = await startBuiltHub({ TARELINE_SCALE: 'sim://?format=headered&seed=5' });
    browser = await launchBrowser();
  });

  afterAll(async () => {
    await browser?.close();
    await hub?.stop();
  });

  it("shows the simulator's weight changing as a cup is placed and part A poured", async () => {
    const page = await browser.context.newPage();
    // A signed-out visitor is sent to the desk sign-in and back (demo lead, README).
    await page.goto(`${hub.url}/bench/bench-1/scale`);
    await page.getByLabel('E-mail').fill('ilse.varga@hollin-ridge.example');
    await page.getByLabel('Password').fill('ridge-lead-demo');
    await page.getByRole('button', { name: /sign in/i }).click();
    await page.getByRole('heading', { name: 'Live scale' }).waitFor();
    await page.getByText('Scale: online').waitFor({ timeout: 15_000 });
    const weight = page.getByTestId('net-weight');
    const readWeight = async () => Number((await weight.textContent())?.replace('\u2212', '-'));
    expect(Math.abs(await readWeight())).toBeLessThan(1);

    // Big enough to read from across the bench: digits at least 120 px high at 1280 × 800.
    const box = await weight.boundingBox();
    expect(box?.height).toBeGreaterThanOrEqual(120);

    const place = await driveSimulator(hub.url, [{ do: 'place-cup', massG: 40 }, { do: 'settle' }]);
    expect(place.status).toBe(200);
    await page.waitForFunction(
      () =>
        Math.abs(Number(document.querySelector('[data-testid="net-weight"]')?.textContent) - 40) <
        0.1,
      undefined,
      { timeout: 10_000 },
    );

    // A pour in the background: the number climbs while it runs.
    const pour = driveSimulator(hub.url, [
      { do: 'pour', grams: 30, rateGPerS: 10 },
      { do: 'settle' },
    ]);
    await page.waitForFunction(
      () => {
        const g = Number(document.querySelector('[data-testid="net-weight"]')?.textContent);
        return g > 45 && g < 69;
      },
      undefined,
      { timeout: 10_000 },
    );
    await page.screenshot({ path: join(artifactsDir, 'live-scale-pouring.png') });
    expect((await pour).status).toBe(200);
    await page.waitForFunction(
      () =>
        Math.abs(Number(document.querySelector('[data-testid="net-weight"]')?.textContent) - 70) <
        0.3,
      undefined,
      { timeout: 10_000 },
    );
    await page.getByText(/stable · gross/).waitFor();
    await page.screenshot({ path: join(artifactsDir, 'live-scale.png') });
  });
});
