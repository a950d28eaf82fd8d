import { mkdir, mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { chromium, type BrowserContext } from 'playwright-core';

export const artifactsDir = resolve(import.meta.dirname, '..', '..', '..', 'artifacts');

/**
 * Debian's Chromium driven by playwright-core. Never a downloaded browser: CI installs the
 * `chromium` package. The flags keep it off the network, which is closed here.
 */
export async function launchBrowser(
  viewport = { width: 1280, height: 800 },
): Promise<{ context: BrowserContext; close: () => Promise<void> }> {
  await mkdir(artifactsDir, { recursive: true });
  const profile = await mkdtemp(join(tmpdir(), 'tareline-chromium-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    headless: true,
    viewport,
    args: [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
  });
  return {
    context,
    close: async () => {
      await context.close();
      await rm(profile, { recursive: true, force: true });
    },
  };
}
