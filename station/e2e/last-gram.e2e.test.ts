import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { artifactsDir, launchBrowser } from './support/browser';
import { batchFromHub, LONG, quickBenchEnv, scanBadge, steadyAt } from './support/bench';
import { startBuiltHub, type HubProcess } from './support/hub-process';

// The bench's own case of a batch too small for its scale, tried as an operator would: 2 g of a
// 100:27 epoxy (LR-27 in the demo shop) on a 0.01 g scale, part B about 0.42 g at ±1 %.
describe('the last gram at the bench, in Chromium', () => {
  let hub: HubProcess;
  let browser: Awaited<ReturnType<typeof launchBrowser>>;

  beforeAll(async () => {
    hub = await startBuiltHub(quickBenchEnv(41));
    browser = await launchBrowser();
  });

  afterAll(async () => {
    await browser?.close();
    await hub?.stop();
  });

  it('warns before weighing, starts on a lead’s leave, and magnifies the band near the target', async () => {
    const page = await browser.context.newPage();
    await scanBadge(page, hub.url, 'HR-1003');
    await page.getByText('Signed in: Joss Whitcombe').waitFor(LONG);
    await page.getByRole('button', { name: /Clear laminating epoxy LR-27/ }).click(LONG);
    await page.getByRole('textbox', { name: 'Total mass to mix' }).fill('2');

    // USP <41> at the readability: m_min = 2 × 0.41 × 0.01 g / 1 % = 0.82 g; part B is
    // 2 × 27 / 127 = 0.425 g; smallest batch 0.82 × 127 / 27 = 3.86 g (hand calculation).
    const warning = page.getByRole('alert').filter({ hasText: 'Too small for this scale' });
    await warning.waitFor(LONG);
    expect(await warning.textContent()).toMatch(/Part B \(Hardener\) would be 0\.425 g/);
    expect(await warning.textContent()).toMatch(/smallest batch it can weigh is 3\.86 g/);
    expect(await warning.getByRole('button', { name: 'Use 3.86 g' }).isVisible()).toBe(true);
    await page.screenshot({ path: join(artifactsDir, 'last-gram-warning.png') });

    await page.getByRole('button', { name: 'Next: lots' }).click();
    await page.getByRole('button', { name: 'Next: prepare' }).click();
    await page.getByRole('button', { name: 'Start weighing' }).click();
    // The hub refuses it without a lead; the lead types their e-mail and password at the bench.
    const leadForm = page.getByRole('form', { name: 'A lead allows this batch' });
    await leadForm.waitFor(LONG);
    await leadForm.getByLabel("Lead's e-mail").fill('ilse.varga@hollin-ridge.example');
    await leadForm.getByLabel("Lead's password").fill('ridge-lead-demo');
    await leadForm.getByRole('button', { name: "Start with the lead's leave" }).click();
    // Part A: 2 × 100 / 127 = 1.5748 g → shown 1.57 g.
    await page.getByRole('heading', { name: 'Weigh Part A (Resin): 1.57 g' }).waitFor(LONG);
    await page.getByText('Scale: online').waitFor(LONG);
    await page.getByText('No balance here: drive the simulated scale').click();
    await page.getByRole('button', { name: 'Place a 40 g cup' }).click(LONG);
    await steadyAt(page, 40);
    await page.getByRole('button', { name: 'Tare' }).click();
    await steadyAt(page, 0);

    // Into the slow-down zone (from 90 % of 1.5748 = 1.417 g), short of the band (1.559 g).
    await page.getByRole('textbox', { name: /^Pour/ }).fill('1.5');
    await page.getByRole('button', { name: 'Pour it' }).click();
    await page.getByText('The simulator is busy…').waitFor({ state: 'detached', ...LONG });
    await steadyAt(page, 1.5);
    const track = page.locator('[data-testid="gauge-track"][data-view="fine"]');
    await track.waitFor(LONG);
    const trackBox = (await track.boundingBox())!;
    const bandBox = (await track.locator('[data-zone="band"]').boundingBox())!;
    // The band as drawn, against the gauge as drawn: at least a quarter.
    expect(bandBox.width / trackBox.width).toBeGreaterThanOrEqual(0.25);
    expect(await page.getByTestId('to-go').textContent()).toMatch(/^0\.0\d g to go$/);
    // Read from two metres: the target line and the step name at 32 px or more.
    const px = (selector: string) =>
      page
        .locator(selector)
        .first()
        .evaluate((el) => parseFloat(getComputedStyle(el).fontSize));
    expect(await px('[data-testid="target-line"]')).toBeGreaterThanOrEqual(32);
    expect(await px('section[aria-label^="Gauge"] h2')).toBeGreaterThanOrEqual(32);
    await page.screenshot({ path: join(artifactsDir, 'last-gram-fine-view.png') });

    // The lead who allowed it is on the batch's record.
    const header = (await page.getByText(/ · batch \d+/).textContent())!;
    const batchId = Number(header.match(/batch (\d+)/)![1]);
    const batch = await batchFromHub(page, hub.url, batchId);
    expect(batch.scaleOverride?.by.name).toMatch(/Ilse/);
  }, 240_000);

  it('saves a three-part batch whose step fits 1280 × 800 and whose label fits 62 × 100 mm', async () => {
    const page = await browser.context.newPage();
    await page.goto(`${hub.url}/bench?bench=bench-1`);
    // The first test's batch may still be open: abandon it, as an operator would.
    const abandon = page.getByRole('button', { name: 'Abandon batch…' });
    const ur60 = page.getByRole('button', { name: /urethane rubber UR-60/ });
    const signIn = page.getByRole('heading', { name: 'Scan your badge' });
    await abandon.or(ur60).or(signIn).first().waitFor(LONG);
    if (await signIn.isVisible()) {
      await scanBadge(page, hub.url, 'HR-1003');
      await page.getByText('Signed in: Joss Whitcombe').waitFor(LONG);
      await abandon.or(ur60).first().waitFor(LONG);
    }
    if (await abandon.isVisible()) {
      await abandon.click();
      await page.getByRole('textbox', { name: /reason/i }).fill('test: only the fine view');
      await page.getByRole('button', { name: 'Abandon batch', exact: true }).click();
      await page.getByRole('button', { name: 'Next batch' }).click(LONG);
    }

    // UR-60 (demo shop): 100:80:2 by weight, ±2 %; 182 g → 100 g, 80 g and 2 g.
    await page.getByRole('button', { name: /urethane rubber UR-60/ }).click(LONG);
    await page.getByRole('textbox', { name: 'Total mass to mix' }).fill('182');
    await page.getByRole('button', { name: 'Next: lots' }).click();
    // Long lot codes, as some suppliers print them.
    const lots = [
      'UR60-A-2026-11-DRUM-0042-BATCH-7781920',
      'UR60-B-2026-10-PAIL-0017-BATCH-7781544',
      'PIGMENT-CHARCOAL-2026-09-JAR-0003-QC-77',
    ];
    await page.getByLabel('Lot code, Part A').fill(lots[0]!);
    await page.getByLabel('Lot code, Part B').fill(lots[1]!);
    await page.getByLabel(/^Lot code, Part C/).fill(lots[2]!);
    await page.getByRole('button', { name: 'Next: prepare' }).click();
    await page.getByRole('button', { name: 'Skip stirring…' }).click();
    await page.getByRole('button', { name: 'Yes, skip: it is stirred' }).click();
    await page.getByRole('button', { name: 'Start weighing' }).click();
    await page.getByRole('heading', { name: /^Weigh Part A.*: 100\.00 g$/ }).waitFor(LONG);
    await page.getByText('Scale: online').waitFor(LONG);
    await page.getByText('No balance here: drive the simulated scale').click();
    await page.getByRole('button', { name: 'Lift the cup' }).click(LONG);
    await page.getByRole('button', { name: 'Place a 40 g cup' }).click();
    // The balance may still hold the last batch's tare: whatever it shows, tare once steady.
    await page.getByText(/^stable · gross 4\d\./).waitFor(LONG);
    await page.getByRole('button', { name: 'Tare' }).click();
    await steadyAt(page, 0);
    const pour = async (grams: number) => {
      await page.getByRole('textbox', { name: /^Pour/ }).fill(String(grams));
      await page.getByRole('button', { name: 'Pour it' }).click();
      await page.getByText('The simulator is busy…').waitFor({ state: 'detached', ...LONG });
    };
    await pour(100);
    await steadyAt(page, 100);
    await page.getByRole('button', { name: 'Part A done' }).click();
    await page
      .getByRole('heading', { name: /^Weigh Part B.*: (79\.9\d|80\.0\d) g$/ })
      .waitFor(LONG);
    await steadyAt(page, 0);
    await pour(80);
    await page.getByRole('heading', { name: /^Weigh Part C.*: 2\.00 g$/ }).waitFor(LONG);
    await steadyAt(page, 0);
    await pour(2);
    await page.getByRole('heading', { name: /^Batch \d+ saved$/ }).waitFor(LONG);
    await page.getByRole('article', { name: /^Cup label/ }).waitFor(LONG);

    await page.screenshot({ path: join(artifactsDir, 'last-gram-saved-1280.png'), fullPage: true });
    // The whole saved step, from the steps to the label, on one 1280 × 800 screen (the simulator
    // fold-out below it is a demo aid, not part of the step).
    // Driving the simulator below the flow scrolled the page; an operator at a real balance
    // would not have: back to the top, as the saved step is first seen.
    await page.evaluate(() => window.scrollTo(0, 0));
    const step = page.locator('section[aria-labelledby="saved-batch-title"]');
    const stepBox = (await step.boundingBox())!;
    expect(await page.evaluate(() => window.scrollY)).toBe(0);
    expect(stepBox.y + stepBox.height).toBeLessThanOrEqual(800);

    const label = page.getByRole('article', { name: /^Cup label/ });
    const box = (await label.boundingBox())!;
    // CSS millimetres: 96 px to the inch, 25.4 mm to the inch (CSS Values and Units, level 3).
    const mm = (px: number) => (px * 25.4) / 96;
    expect(mm(box.width)).toBeLessThanOrEqual(62.1);
    expect(mm(box.height)).toBeLessThanOrEqual(100.1);
    // Nothing cut off: the label's content is no taller than the label.
    expect(await label.evaluate((el) => el.scrollHeight <= el.clientHeight + 1)).toBe(true);
    for (const code of lots) expect(await label.textContent()).toContain(code);
    expect(await label.textContent()).toContain('Joss Whitcombe');
  }, 300_000);
});
