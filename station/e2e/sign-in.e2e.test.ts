import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { artifactsDir, launchBrowser } from './support/browser';
import { startBuiltHub, type HubProcess } from './support/hub-process';

// Demo shop (README): Tomas Reyl, badge HR-1001, PIN 1357; bench-1 signs out after 5 idle minutes.
describe('bench sign-in in Chromium', () => {
  let hub: HubProcess;
  let browser: Awaited<ReturnType<typeof launchBrowser>>;

  beforeAll(async () => {
    hub = await startBuiltHub();
    browser = await launchBrowser();
  });

  afterAll(async () => {
    await browser?.close();
    await hub?.stop();
  });

  it('signs in with a scanned badge and the PIN pad, then signs out when idle', async () => {
    const page = await browser.context.newPage();
    // The page's own clock, so five idle minutes pass in a moment; the hub keeps real time.
    await page.clock.install();
    await page.goto(`${hub.url}/bench?bench=bench-1`);
    await page.getByRole('heading', { name: 'Scan your badge' }).waitFor();

    // A badge reader: the code as fast key presses and Enter, with no text box focused.
    expect(await page.evaluate(() => document.activeElement === document.body)).toBe(true);
    await page.keyboard.type('HR-1001');
    await page.keyboard.press('Enter');

    const pad = page.getByRole('group', { name: 'PIN pad' });
    await pad.waitFor();
    const key = pad.getByRole('button', { name: '5', exact: true });
    const box = await key.boundingBox();
    expect(box?.height).toBeGreaterThanOrEqual(56);
    expect(box?.width).toBeGreaterThanOrEqual(56);
    for (const digit of ['1', '3', '5', '7']) {
      await pad.getByRole('button', { name: digit, exact: true }).click();
    }
    await pad.getByRole('button', { name: 'OK' }).click();

    await page.getByText('Signed in: Tomas Reyl').waitFor();
    await page.getByRole('button', { name: 'Switch person' }).waitFor();
    await page.screenshot({ path: join(artifactsDir, 'bench-signed-in.png') });

    // Idle: the countdown shows in the last 30 s, then the bench is back at sign-in.
    await page.clock.fastForward('04:40');
    await page.getByText(/Signing out in \d+ s/).waitFor();
    await page.screenshot({ path: join(artifactsDir, 'bench-idle-countdown.png') });
    await page.clock.fastForward('00:30');
    await page.getByRole('heading', { name: 'Scan your badge' }).waitFor();
    expect(await page.getByText('Tomas Reyl').count()).toBe(0);
  });
});
