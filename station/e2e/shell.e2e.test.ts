import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { artifactsDir, launchBrowser } from './support/browser';
import { startBuiltHub, type HubProcess } from './support/hub-process';

describe('the built product in Chromium', () => {
  let hub: HubProcess;
  let browser: Awaited<ReturnType<typeof launchBrowser>>;

  beforeAll(async () => {
    hub = await startBuiltHub();
    browser = await launchBrowser();
  });

  afterAll(async () => {
    await browser?.close();
    const code = await hub?.stop();
    // Ctrl-C closes the database cleanly and exits 0.
    expect(code).toBe(0);
    expect(hub.output()).toContain('Embedded PostgreSQL closed');
  });

  it('renders the shell in Barlow, served by the hub, with the hub connected', async () => {
    const page = await browser.context.newPage();
    const foreignRequests: string[] = [];
    page.on('request', (req) => {
      if (!req.url().startsWith(hub.url)) foreignRequests.push(req.url());
    });
    await page.goto(`${hub.url}/`);
    await page.getByRole('heading', { name: 'Scan your badge' }).waitFor();
    expect(page.url()).toBe(`${hub.url}/bench`);
    await page.getByText('Hub: connected').waitFor({ timeout: 15_000 });

    await page.evaluate(() => document.fonts.ready);
    const barlowLoaded = await page.evaluate(() => document.fonts.check('600 24px Barlow'));
    expect(barlowLoaded).toBe(true);
    const family = await page.evaluate(() => getComputedStyle(document.body).fontFamily);
    expect(family).toMatch(/^"?Barlow/);
    // Nothing, fonts included, comes from anywhere but the hub.
    expect(foreignRequests).toEqual([]);

    await page.screenshot({ path: join(artifactsDir, 'shell.png') });
  });

  it('serves a client route directly (fallback to index.html)', async () => {
    const page = await browser.context.newPage();
    const response = await page.goto(`${hub.url}/review`);
    expect(response?.status()).toBe(200);
    // Signed out, the review area sends the visitor to the desk sign-in.
    await page.getByRole('heading', { name: 'Sign in' }).waitFor();
  });
});
