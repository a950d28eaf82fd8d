import type { Batch, SimulatorStep } from '@tareline/protocol';
import type { Page } from 'playwright-core';

/** The machine is shared and slow under load: generous waits. */
export const LONG = { timeout: 45_000 };

/**
 * A quick simulated balance (0.01 g, small noise, simulated time 4× the wall clock) and a short
 * dwell before the hub saves by itself, as the hub's own batch tests use.
 */
export function quickBenchEnv(seed: number): Record<string, string> {
  return {
    TARELINE_SCALE: `sim://?format=headered&rateHz=20&noiseG=0.002&speed=4&seed=${seed}`,
    TARELINE_SAVE_DWELL_MS: '800',
  };
}

/** Signs in at bench-1 as a badge reader would: fast keys and Enter, no text box focused. */
export async function scanBadge(page: Page, hubUrl: string, badge: string): Promise<void> {
  await page.goto(`${hubUrl}/bench?bench=bench-1`);
  await page.getByRole('heading', { name: 'Scan your badge' }).waitFor(LONG);
  await page.keyboard.type(badge);
  await page.keyboard.press('Enter');
}

/** Waits until the gauge's net weight is within 0.05 g of `grams` and the scale is steady. */
export async function steadyAt(page: Page, grams: number): Promise<void> {
  await page.waitForFunction(
    (g) =>
      Math.abs(
        Number(
          document.querySelector('[data-testid="net-weight"]')?.textContent?.replace('\u2212', '-'),
        ) - g,
      ) < 0.05,
    grams,
    LONG,
  );
  await page.getByText(/^stable · gross/).waitFor(LONG);
}

/** A batch as the hub stores it, read with the page's own sign-in (as an audit would). */
export async function batchFromHub(page: Page, hubUrl: string, id: number): Promise<Batch> {
  const token = await page.evaluate(
    () =>
      (JSON.parse(localStorage.getItem('tareline.session') ?? '{}') as { token?: string }).token,
  );
  const res = await fetch(`${hubUrl}/api/batches/${id}`, {
    headers: { Authorization: `Bearer ${token}` },
  });
  if (res.status !== 200) throw new Error(`GET /api/batches/${id} answered ${res.status}`);
  return (await res.json()) as Batch;
}

/**
 * Drives bench-1's simulated scale as the demo lead (desk sign-in, README): the simulator route
 * pours and unplugs as a person at the bench would, so it needs someone who may work there.
 */
export async function driveSimulator(hubUrl: string, steps: SimulatorStep[]): Promise<Response> {
  const login = await fetch(`${hubUrl}/api/auth/login`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/json' },
    body: JSON.stringify({ email: 'ilse.varga@hollin-ridge.example', password: 'ridge-lead-demo' }),
  });
  const { token } = (await login.json()) as { token: string };
  return fetch(`${hubUrl}/api/benches/bench-1/simulator`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/json', Authorization: `Bearer ${token}` },
    body: JSON.stringify(steps),
  });
}
