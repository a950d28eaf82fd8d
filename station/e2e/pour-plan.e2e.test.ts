import type { Batch, Material, SimulatorStep } from '@tareline/protocol';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { artifactsDir, launchBrowser } from './support/browser';
import { batchFromHub, driveSimulator, LONG, quickBenchEnv, scanBadge } from './support/bench';
import { startBuiltHub, type HubProcess } from './support/hub-process';

const LEAD = { email: 'ilse.varga@hollin-ridge.example', password: 'ridge-lead-demo' };

/** A small PDF: the `%PDF-` header (ISO 32000-1, 7.5.2), some body, the end marker. */
const SDS = Buffer.concat([
  Buffer.from('%PDF-1.7\n%\xe2\xe3\xcf\xd3\n', 'latin1'),
  Buffer.from('1 0 obj << /Type /Catalog >> endobj\n'.repeat(40)),
  Buffer.from('%%EOF\n'),
]);

describe('a pour plan and a data sheet, from the lead to the bench', () => {
  let hub: HubProcess;
  let browser: Awaited<ReturnType<typeof launchBrowser>>;

  beforeAll(async () => {
    hub = await startBuiltHub(quickBenchEnv(17));
    browser = await launchBrowser();
  });

  afterAll(async () => {
    await browser?.close();
    await hub?.stop();
  });

  async function simulate(steps: SimulatorStep[]): Promise<void> {
    expect((await driveSimulator(hub.url, steps)).status).toBe(200);
  }

  it('a lead uploads the SDS and saves a plan; an operator pours from it and opens the SDS in one touch', async () => {
    const login = await fetch(`${hub.url}/api/auth/login`, {
      method: 'POST',
      headers: { 'Content-Type': 'application/json' },
      body: JSON.stringify(LEAD),
    });
    const { token } = (await login.json()) as { token: string };
    const materials = (await (
      await fetch(`${hub.url}/api/materials`, { headers: { Authorization: `Bearer ${token}` } })
    ).json()) as Material[];
    const lr27 = materials.find((m) => m.name.includes('LR-27'))!;

    // The lead: the material's data sheets page, by the desk sign-in.
    const page = await browser.context.newPage();
    await page.goto(`${hub.url}/materials/${lr27.id}/documents`);
    await page.getByLabel('E-mail').fill(LEAD.email);
    await page.getByLabel('Password').fill(LEAD.password);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page
      .getByRole('heading', { name: /Data sheets: Clear laminating epoxy LR-27/ })
      .waitFor(LONG);
    await page.getByLabel('PDF file (at most 20 MB)').setInputFiles({
      name: 'lr27-sds.pdf',
      mimeType: 'application/pdf',
      buffer: SDS,
    });
    await page.getByRole('button', { name: 'Upload' }).click();
    await page.getByRole('link', { name: 'lr27-sds.pdf' }).waitFor(LONG);
    await page.screenshot({ path: join(artifactsDir, 'material-documents.png') });

    // A plan for a 4 × 2 × 1 in box of LR-27.
    await page.goto(`${hub.url}/plans/new`);
    await page.getByRole('textbox', { name: 'Mold or part' }).fill('Gauge cover, top half');
    await page.getByRole('textbox', { name: 'Mold reference' }).fill('M-207');
    await page
      .getByRole('combobox', { name: 'Material' })
      .selectOption({ label: 'Clear laminating epoxy LR-27' });
    await page.getByRole('textbox', { name: 'Length' }).fill('4');
    await page.getByRole('textbox', { name: 'Width' }).fill('2');
    await page.getByRole('textbox', { name: 'Height' }).fill('1');
    // No scale at hand: the planner shows fill marks and pump strokes for the same plan.
    await page.getByText('No scale: fill marks and pump strokes').click();
    await page.getByRole('list', { name: 'Fill marks' }).waitFor();
    await page.screenshot({ path: join(artifactsDir, 'plan-editor.png'), fullPage: true });
    await page.getByRole('button', { name: 'Save the pour plan' }).click();
    await page.getByRole('heading', { name: 'Gauge cover, top half' }).waitFor(LONG);
    const planId = page.url().split('/plans/')[1]!;
    // 4 × 2 × 1 in = 8 in³ × 16.387 064 cm³/in³ (1959 inch) × SG 1.12 = 146.83 g.
    await page.getByText('146.8 g').waitFor();

    // The operator at bench-1.
    await page.evaluate(() => localStorage.clear());
    await scanBadge(page, hub.url, 'HR-1003');
    await page.getByText('Signed in: Joss Whitcombe').waitFor(LONG);
    await page.getByRole('button', { name: /Gauge cover, top half/ }).click(LONG);
    await page.getByRole('button', { name: 'Next: prepare' }).click(LONG);

    // One touch on the SDS opens the PDF in a new tab, without the session's token.
    const sdsLink = page.getByRole('link', { name: 'Open the safety data sheet (PDF)' });
    await sdsLink.waitFor(LONG);
    const [tab] = await Promise.all([browser.context.waitForEvent('page'), sdsLink.click()]);
    await tab.waitForURL(/\/api\/documents\/.+\/open\?link=/, LONG).catch(() => undefined);
    const opened = await fetch(tab.url());
    expect(opened.status).toBe(200);
    expect(opened.headers.get('content-type')).toBe('application/pdf');
    expect(Buffer.from(await opened.arrayBuffer()).equals(SDS)).toBe(true);
    await tab.close();

    await page.getByRole('button', { name: 'Start weighing' }).click();
    await page.getByRole('heading', { name: /^Weigh Part A \(Resin\)/ }).waitFor(LONG);
    await page.getByText('Scale: online').waitFor(LONG);
    await simulate([{ do: 'place-cup', massG: 35 }, { do: 'settle' }]);
    await page.getByRole('button', { name: 'Tare' }).click();
    const partADone = page.getByRole('button', { name: 'Part A done' });
    await partADone.waitFor(LONG);
    // 146.83 g split 100 : 27 by weight: 115.61 g of resin.
    await simulate([{ do: 'pour', grams: 115.61, rateGPerS: 40 }, { do: 'settle' }]);
    await page.getByText(/^stable · gross/).waitFor(LONG);
    await partADone.click();
    await page.getByRole('heading', { name: /^Weigh Part B \(Hardener\)/ }).waitFor(LONG);
    await page.waitForFunction(
      () =>
        Math.abs(Number(document.querySelector('[data-testid="net-weight"]')?.textContent)) < 0.05,
      undefined,
      LONG,
    );
    // Part B follows part A as poured: 115.61 × 27 / 100 = 31.21 g.
    await simulate([
      { do: 'pour', grams: 30, rateGPerS: 6 },
      { do: 'pour', grams: 1.21, rateGPerS: 0.5 },
      { do: 'settle' },
    ]);
    const savedHeading = page.getByRole('heading', { name: /^Batch \d+ saved$/ });
    await savedHeading.waitFor(LONG);
    const batchId = Number((await savedHeading.textContent())!.match(/\d+/)![0]);

    const batch: Batch = await batchFromHub(page, hub.url, batchId);
    expect(batch).toMatchObject({ planId, state: 'saved', verdict: 'GO' });
    expect(batch.totalMassG).toBeCloseTo(146.83, 2);

    // The plan's page lists the batch poured from it.
    await page.getByRole('button', { name: 'Next batch' }).click();
    await page.goto(`${hub.url}/plans/${planId}`);
    await page
      .getByRole('list', { name: 'Batches from this plan' })
      .getByRole('link', { name: `Batch ${batchId}` })
      .waitFor(LONG);
    await page.screenshot({ path: join(artifactsDir, 'pour-plan-page.png'), fullPage: true });
  }, 300_000);
});
