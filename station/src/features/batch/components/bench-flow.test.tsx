import type { Batch } from '@tareline/protocol';
import { screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { routes } from '../../../app/router';
import { setSession } from '../../../lib/auth';
import { signInAnswer, stubHub, type FakeRequest } from '../../../testing/fake-hub';
import { renderRoutes } from '../../../testing/render';
import { liveSocket, openedSockets } from '../../../testing/fake-live-socket';
import {
  batchFixture,
  partBFixture,
  pourFixture,
  readingFixture,
} from '../../../testing/live-fixtures';
import { retired, sc14, sc14Lots } from '../testing/materials';

vi.mock('socket.io-client', () =>
  import('../../../testing/fake-live-socket').then((m) => m.fakeSocketIo),
);

const user = userEvent.setup({ delay: null });

type Handlers = Parameters<typeof stubHub>[0];

/** The hub of a bench with SC-14 on the shelf and, unless told, no batch open. */
function hubWith(handlers: Handlers = {}, current: Batch | null = null): FakeRequest[] {
  return stubHub({
    'GET /batches/current?benchId=bench-1': () => [200, { batch: current }],
    'GET /materials': () => [200, [retired, sc14]],
    'GET /lots?materialId=mat-sc14': () => [200, sc14Lots],
    'GET /benches': () => [200, []],
    ...handlers,
  });
}

function openBench() {
  setSession(signInAnswer({ name: 'Joss Whitcombe', role: 'operator' }, { id: 'bench-1' }));
  renderRoutes(routes, '/bench');
}

/** The hub's side of the socket: connected, scale online. */
function scaleOnline() {
  liveSocket().fire('connect');
  liveSocket().fire('scaleStatus', { benchId: 'bench-1', state: 'online', detail: 'sim' });
}

const hubSays = (batch: Batch) => liveSocket().fire('batch', { benchId: 'bench-1', batch });

/** Material, 114 g, no lots, stirring skipped: the prep step's "Start weighing" pressed. */
async function throughPrep() {
  await user.click(await screen.findByRole('button', { name: /Grey surface-coat epoxy SC-14/ }));
  await user.type(screen.getByRole('textbox', { name: 'Total mass to mix' }), '114');
  await user.click(screen.getByRole('button', { name: 'Next: lots' }));
  await user.click(await screen.findByRole('button', { name: 'Next: prepare' }));
  await user.click(screen.getByRole('button', { name: 'Skip stirring…' }));
  await user.click(screen.getByRole('button', { name: 'Yes, skip: it is stirred' }));
  await user.click(screen.getByRole('button', { name: 'Start weighing' }));
}

beforeEach(() => {
  openedSockets.length = 0;
});
afterEach(() => {
  openedSockets.length = 0;
});

describe('choosing what to mix', { timeout: 20_000 }, () => {
  it('offers only materials in use, with ratio and pot life, and checks the amount', async () => {
    hubWith();
    openBench();
    const card = await screen.findByRole('button', { name: /Grey surface-coat epoxy SC-14/ });
    expect(card).toHaveTextContent('Mix ratio 100 : 14 by weight');
    expect(card).toHaveTextContent('Pot life 25 min at 100 g');
    expect(screen.queryByText('Old tooling epoxy TE-1')).not.toBeInTheDocument();

    await user.click(card);
    const amount = screen.getByRole('textbox', { name: 'Total mass to mix' });
    await user.type(amount, '-5');
    await user.click(screen.getByRole('button', { name: 'Next: lots' }));
    expect(await screen.findByText('The total mass must be more than zero')).toBeInTheDocument();
    expect(amount).toHaveAttribute('aria-invalid', 'true');
    await user.clear(amount);
    await user.type(amount, 'lots');
    await user.click(screen.getByRole('button', { name: 'Next: lots' }));
    expect(await screen.findByText('The total mass must be a number')).toBeInTheDocument();
  });

  it('takes the total from the volume estimator', async () => {
    hubWith();
    openBench();
    await user.click(await screen.findByRole('button', { name: /SC-14/ }));
    await user.click(screen.getByRole('button', { name: 'Work it out from the mold' }));
    // The estimator loads on demand; the material's tolerance is the batch's: not asked for again.
    expect(await screen.findByText(/within ± 1 %, the material's tolerance/)).toBeInTheDocument();
    expect(screen.queryByRole('textbox', { name: 'Tolerance' })).not.toBeInTheDocument();
    await user.type(screen.getByRole('textbox', { name: 'Length' }), '10');
    await user.type(screen.getByRole('textbox', { name: 'Width' }), '10');
    await user.type(screen.getByRole('textbox', { name: 'Height' }), '1');
    await user.selectOptions(screen.getByRole('combobox', { name: 'Length unit' }), 'cm');
    // 10 × 10 × 1 cm = 100 cm³; at SG 1.65 that is 165 g (SG times volume, water = 1 g/cm³).
    await user.click(await screen.findByRole('button', { name: /Use this total: 165/ }));
    expect(screen.getByRole('textbox', { name: 'Total mass to mix' })).toHaveValue('165');
    expect(screen.queryByRole('form', { name: 'Volume estimator' })).not.toBeInTheDocument();
  });

  it('puts a scanned lot label on its part and shows the hub warning for it', async () => {
    hubWith();
    openBench();
    await user.click(await screen.findByRole('button', { name: /SC-14/ }));
    await user.type(screen.getByRole('textbox', { name: 'Total mass to mix' }), '114');
    await user.click(screen.getByRole('button', { name: 'Next: lots' }));
    await screen.findByRole('group', { name: /Lots of Part B \(Hardener\)/ });
    // A label reader types fast and presses Enter while no box has the focus.
    (document.activeElement as HTMLElement | null)?.blur();
    await user.keyboard('SC14H-2511{Enter}');
    expect(screen.getByRole('textbox', { name: 'Lot code, Part B (Hardener)' })).toHaveValue(
      'SC14H-2511',
    );
    expect(screen.getByRole('textbox', { name: 'Lot code, Part A (Resin)' })).toHaveValue('');
    expect(screen.getByRole('alert')).toHaveTextContent('Lot SC14H-2511 expired on 2026-11-30');
    // Part A picked from the shelf list.
    await user.click(screen.getByRole('button', { name: /SC14R-2609/ }));
    expect(screen.getByRole('textbox', { name: 'Lot code, Part A (Resin)' })).toHaveValue(
      'SC14R-2609',
    );
  });

  it('shows what each shelf lot holds, and warns before weighing of a lot the batch would overdraw', async () => {
    hubWith();
    openBench();
    await user.click(await screen.findByRole('button', { name: /SC-14/ }));
    // 4 300 g at 100 : 14 by weight takes 3 771.9 g of resin and 528.1 g of hardener
    // (4300 × 14 / 114, worked by hand from the definition of parts by weight).
    await user.type(screen.getByRole('textbox', { name: 'Total mass to mix' }), '4300');
    await user.click(screen.getByRole('button', { name: 'Next: lots' }));
    const resin = await screen.findByRole('button', { name: /SC14R-2609/ });
    expect(resin).toHaveTextContent('4.21 kg on hand');
    await user.click(resin);
    expect(screen.queryByRole('alert')).toBeNull();
    await user.click(screen.getByRole('button', { name: /SC14H-2511/ }));
    expect(screen.getAllByRole('alert').map((a) => a.textContent)).toEqual([
      expect.stringContaining('Lot SC14H-2511 expired on 2026-11-30'),
      expect.stringContaining('Lot SC14H-2511 has 380 g left, this batch needs 528.1 g'),
    ]);
  });

  it('shows the cautions and the SDS, holds Start until stirred, and shows a refusal in words', async () => {
    const requests = hubWith({
      'POST /batches': () => [
        409,
        { message: 'Batch 6 is still open on this bench: finish or abandon it first', errors: [] },
      ],
    });
    openBench();
    await user.click(await screen.findByRole('button', { name: /SC-14/ }));
    await user.type(screen.getByRole('textbox', { name: 'Total mass to mix' }), '114');
    await user.click(screen.getByRole('button', { name: 'Next: lots' }));
    await user.click(await screen.findByRole('button', { name: 'Next: prepare' }));
    expect(screen.getByText(/wear nitrile gloves/)).toBeInTheDocument();
    expect(screen.getByText(/SDS binder, tab 3/)).toBeInTheDocument();
    expect(screen.getByText(/sensitise skin and lungs/)).toBeInTheDocument();
    expect(screen.getByRole('timer', { name: 'Stirring time left' })).toHaveTextContent('3:00');
    expect(screen.getByRole('button', { name: 'Start weighing' })).toBeDisabled();
    await user.click(screen.getByRole('button', { name: 'Skip stirring…' }));
    await user.click(screen.getByRole('button', { name: 'Yes, skip: it is stirred' }));
    await user.click(screen.getByRole('button', { name: 'Start weighing' }));
    expect(await screen.findByRole('alert')).toHaveTextContent(
      'The batch did not start: Batch 6 is still open on this bench: finish or abandon it first',
    );
    expect(requests.find((r) => r.method === 'POST')?.body).toEqual({
      benchId: 'bench-1',
      materialId: 'mat-sc14',
      totalMassG: 114,
      lots: [],
    });
  });
});

describe('weighing on the live gauge', { timeout: 20_000 }, () => {
  it('tares, confirms part A once steady, and says "saved" only when the hub does', async () => {
    const requests = hubWith({
      'POST /batches': () => [201, batchFixture()],
      'POST /batches/7/tare': () => [
        201,
        batchFixture({ active: { ...batchFixture().active!, tared: true } }),
      ],
      'POST /batches/7/next': () => [201, partBFixture()],
    });
    openBench();
    await throughPrep();
    expect(
      await screen.findByRole('heading', { name: 'Weigh Part A (Resin): 100.00 g' }),
    ).toBeInTheDocument();
    scaleOnline();
    await user.click(screen.getByRole('button', { name: 'Tare' }));
    const done = await screen.findByRole('button', { name: 'Part A done' });
    liveSocket().fire('reading', readingFixture(99.2, false));
    expect(done).toBeDisabled();
    liveSocket().fire('reading', readingFixture(100, true));
    expect(done).toBeEnabled();
    await user.click(done);

    expect(
      await screen.findByRole('heading', { name: 'Weigh Part B (Hardener): 14.00 g' }),
    ).toBeInTheDocument();
    liveSocket().fire('reading', readingFixture(14.1, true));
    liveSocket().fire('pour', pourFixture({ netG: 14.1, verdict: 'GO', saveInMs: 400 }));
    const gauge = screen.getByRole('region', { name: /Gauge: Weigh Part B/ });
    expect(within(gauge).getByText('GO')).toBeInTheDocument();
    expect(screen.getByText('Steady in the band: saving in 0.4 s')).toBeInTheDocument();
    // GO is not saved: nothing says so until the hub's batch event does.
    expect(screen.queryByRole('heading', { name: /saved/i })).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: 'Next batch' })).not.toBeInTheDocument();

    hubSays(
      partBFixture({
        state: 'saved',
        verdict: 'GO',
        active: null,
        ratioDeviationPct: 0.714,
        parts: [
          { label: 'Resin', targetG: 100, actualG: 100 },
          { label: 'Hardener', targetG: 14, actualG: 14.1 },
        ],
        steps: { ...partBFixture().steps, saved: '2027-01-05T09:01:10.000Z' },
        savedAt: '2027-01-05T09:01:10.000Z',
      }),
    );
    expect(await screen.findByRole('heading', { name: 'Batch 7 saved' })).toBeInTheDocument();
    expect(requests.filter((r) => r.method === 'POST').map((r) => r.path)).toEqual([
      '/batches',
      '/batches/7/tare',
      '/batches/7/next',
    ]);

    await user.click(screen.getByRole('button', { name: 'Next batch' }));
    expect(await screen.findByRole('button', { name: /SC-14/ })).toBeInTheDocument();
  });

  it("shows the hub's refusal of an early confirm in its own words", async () => {
    hubWith(
      {
        'POST /batches/7/next': () => [
          409,
          { message: 'Wait until the reading is steady', code: 'NOT_STABLE', errors: [] },
        ],
      },
      batchFixture({ active: { ...batchFixture().active!, tared: true } }),
    );
    openBench();
    const done = await screen.findByRole('button', { name: 'Part A done' });
    scaleOnline();
    liveSocket().fire('reading', readingFixture(50, true));
    await user.click(done);
    expect(await screen.findByRole('alert')).toHaveTextContent('Wait until the reading is steady');
  });

  it('offers the rescue the hub worked out after an over-pour, or NO-GO', async () => {
    const requests = hubWith(
      {
        'POST /batches/7/rescue': () => [
          201,
          partBFixture({
            state: 'weighing-a',
            active: {
              part: 0,
              kind: 'top-up',
              targetG: 3.57,
              band: { lowG: 2.54, highG: 4.6 },
              slowDownFromG: 3.2,
              tared: false,
            },
            steps: { ...partBFixture().steps, rescueTaken: '2027-01-05T09:01:30.000Z' },
          }),
        ],
      },
      partBFixture(),
    );
    openBench();
    await screen.findByRole('heading', { name: 'Weigh Part B (Hardener): 14.00 g' });
    scaleOnline();
    liveSocket().fire('reading', readingFixture(14.5, true));
    // 14.5 × 100 / 14 − 100 = 3.571 g of part A (worked by hand from the definition of parts by weight); the hub sends it.
    liveSocket().fire(
      'pour',
      pourFixture({
        netG: 14.5,
        verdict: 'OVER',
        rescue: { addG: [3.5714, 0], totalAfterG: 118.07, fits: true },
      }),
    );
    expect(
      within(screen.getByRole('region', { name: /Gauge/ })).getByText('OVER'),
    ).toBeInTheDocument();
    const offer = screen.getByRole('region', { name: 'Over the band: the ratio can be restored' });
    expect(offer).toHaveTextContent('Add 3.57 g of Part A (Resin)');
    expect(offer).toHaveTextContent('It fits on the scale');
    // Saving NO-GO asks first; going back leaves the offer as it was.
    await user.click(within(offer).getByRole('button', { name: 'Save as NO-GO…' }));
    expect(within(offer).getByText('Save this batch as NO-GO?')).toBeInTheDocument();
    await user.click(within(offer).getByRole('button', { name: 'No, go back' }));
    expect(requests.at(-1)?.path).not.toBe('/batches/7/save-no-go');
    await user.click(within(offer).getByRole('button', { name: 'Add part A' }));
    expect(
      await screen.findByRole('heading', { name: 'Top up Part A (Resin): 3.57 g' }),
    ).toBeInTheDocument();
    expect(requests.at(-1)).toMatchObject({ method: 'POST', path: '/batches/7/rescue' });
  });

  it('does not say the ratio can be restored when the rescue does not fit', async () => {
    hubWith({}, partBFixture());
    openBench();
    await screen.findByRole('heading', { name: 'Weigh Part B (Hardener): 14.00 g' });
    scaleOnline();
    liveSocket().fire('reading', readingFixture(14.5, true));
    liveSocket().fire(
      'pour',
      pourFixture({
        netG: 14.5,
        verdict: 'OVER',
        rescue: { addG: [3.5714, 0], totalAfterG: 4100, fits: false },
      }),
    );
    const offer = screen.getByRole('region', {
      name: 'Over the band: the rescue does not fit on the scale',
    });
    expect(offer).not.toHaveTextContent(/can be restored/);
    expect(within(offer).getByRole('button', { name: 'Add part A' })).toBeDisabled();
  });

  it('says the batch is not saved while the hub cannot write it', async () => {
    hubWith({}, partBFixture());
    openBench();
    await screen.findByRole('heading', { name: 'Weigh Part B (Hardener): 14.00 g' });
    scaleOnline();
    liveSocket().fire('reading', readingFixture(14.05, true));
    liveSocket().fire(
      'pour',
      pourFixture({
        netG: 14.05,
        verdict: 'GO',
        saveInMs: 0,
        saveProblem: 'The hub could not write the batch to its database; it keeps trying',
      }),
    );
    expect(screen.getByText(/^Not saved yet: The hub could not write the batch/)).toHaveTextContent(
      'Leave the cup on the scale.',
    );
    expect(screen.queryByText(/saving in/)).not.toBeInTheDocument();
    expect(screen.queryByRole('heading', { name: /saved/i })).not.toBeInTheDocument();
  });

  it('gives no verdict and no countdown while the scale is offline', async () => {
    hubWith({}, partBFixture());
    openBench();
    await screen.findByRole('heading', { name: 'Weigh Part B (Hardener): 14.00 g' });
    scaleOnline();
    liveSocket().fire('reading', readingFixture(14, true));
    liveSocket().fire('pour', pourFixture({ verdict: 'GO', saveInMs: 900 }));
    liveSocket().fire('scaleStatus', { benchId: 'bench-1', state: 'offline', detail: 'Unplugged' });
    expect(screen.getByText('No verdict while the scale is offline')).toBeInTheDocument();
    expect(screen.queryByText('GO')).not.toBeInTheDocument();
    expect(screen.queryByText(/saving in/)).not.toBeInTheDocument();
  });
});

describe('a batch that did not go to plan', { timeout: 20_000 }, () => {
  it('picks up an interrupted batch after a reload and resumes it once the scale is back', async () => {
    const interrupted = partBFixture({
      state: 'interrupted',
      interruptedReason: 'The hub restarted during the pour',
      steps: { ...partBFixture().steps, interrupted: '2027-01-05T09:02:00.000Z' },
    });
    const requests = hubWith(
      {
        'POST /batches/7/resume': () => [
          201,
          partBFixture({ steps: { ...interrupted.steps, resumed: '2027-01-05T09:03:00.000Z' } }),
        ],
      },
      interrupted,
    );
    openBench();
    expect(
      await screen.findByRole('heading', { name: 'Batch 7 was interrupted' }),
    ).toBeInTheDocument();
    expect(screen.getByText('The hub restarted during the pour')).toBeInTheDocument();
    const resume = screen.getByRole('button', { name: 'Resume' });
    expect(resume).toBeDisabled();
    expect(screen.getByText(/Resume needs the scale online/)).toBeInTheDocument();
    scaleOnline();
    expect(screen.queryByText(/Resume needs the scale online/)).not.toBeInTheDocument();
    await user.click(resume);
    expect(
      await screen.findByRole('heading', { name: 'Weigh Part B (Hardener): 14.00 g' }),
    ).toBeInTheDocument();
    expect(requests.at(-1)).toMatchObject({ method: 'POST', path: '/batches/7/resume' });
    expect(screen.queryByText(/will be saved NO-GO/)).not.toBeInTheDocument();
  });

  it('says before the pour goes on when a resumed batch can only end NO-GO', async () => {
    const interrupted = partBFixture({
      state: 'interrupted',
      interruptedReason: 'The hub restarted during the pour',
    });
    const reason = 'contents uncertain after a restart: the balance shows 0.00 g';
    hubWith(
      { 'POST /batches/7/resume': () => [201, partBFixture({ noGoReason: reason })] },
      interrupted,
    );
    openBench();
    scaleOnline();
    await user.click(await screen.findByRole('button', { name: 'Resume' }));
    expect(
      await screen.findByText(
        `This batch will be saved NO-GO: ${reason}. A lead decides what happens to it.`,
      ),
    ).toBeInTheDocument();
  });

  it('abandons only with a reason, and says so once the hub has kept it', async () => {
    const requests = hubWith(
      {
        'POST /batches/7/abandon': ({ body }) => [
          201,
          batchFixture({
            state: 'abandoned',
            active: null,
            abandonReason: (body as { reason: string }).reason,
            steps: { ...batchFixture().steps, abandoned: '2027-01-05T09:04:00.000Z' },
          }),
        ],
      },
      batchFixture(),
    );
    openBench();
    await user.click(await screen.findByRole('button', { name: 'Abandon batch…' }));
    const dialog = await screen.findByRole('dialog', { name: 'Abandon batch 7?' });
    await user.click(within(dialog).getByRole('button', { name: 'Abandon batch' }));
    expect(await within(dialog).findByText('Say why the batch is abandoned')).toBeInTheDocument();
    await user.click(within(dialog).getByRole('button', { name: 'Cup tipped over' }));
    await user.click(within(dialog).getByRole('button', { name: 'Abandon batch' }));
    expect(await screen.findByText('Batch 7 abandoned: Cup tipped over')).toBeInTheDocument();
    expect(requests.at(-1)).toMatchObject({
      path: '/batches/7/abandon',
      body: { reason: 'Cup tipped over' },
    });
  });
});
