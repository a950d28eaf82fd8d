import type { MaterialDocument, PourPlan } from '@tareline/protocol';
import { screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it, vi } from 'vitest';
import { routes } from '../../../app/router';
import { setSession } from '../../../lib/auth';
import { signInAnswer, stubHub } from '../../../testing/fake-hub';
import { batchFixture } from '../../../testing/live-fixtures';
import { renderRoutes } from '../../../testing/render';
import { sc14, sc14Lots } from '../testing/materials';

vi.mock('socket.io-client', () =>
  import('../../../testing/fake-live-socket').then((m) => m.fakeSocketIo),
);

const user = userEvent.setup({ delay: null });

const plan: PourPlan = {
  id: 'plan-1',
  name: 'Pump housing, back half',
  moldRef: 'M-114',
  materialId: sc14.id,
  materialName: sc14.name,
  estimate: {
    cavity: { shape: 'box', length: 10, width: 10, height: 1, unit: 'cm' },
    overagePct: 0,
    cupLossG: 0,
  },
  savedTotalMassG: 160,
  totalMassG: 165,
  materialChanged: true,
  createdBy: { id: 'p-ilse', name: 'Ilse Varga' },
  createdAt: '2026-12-01T08:00:00.000Z',
  updatedAt: '2026-12-01T08:00:00.000Z',
};

const sds: MaterialDocument = {
  id: 'doc-1',
  materialId: sc14.id,
  kind: 'sds',
  fileName: 'sc14-sds.pdf',
  sizeBytes: 120_000,
  uploadedAt: '2026-12-01T08:00:00.000Z',
  uploadedBy: { id: 'p-ilse', name: 'Ilse Varga' },
  openUrl: '/api/documents/doc-1/open?link=1800000000000.abcdefghijklmnopqrstuvwxyz',
};

function openBench(handlers: Parameters<typeof stubHub>[0] = {}) {
  const requests = stubHub({
    'GET /batches/current?benchId=bench-1': () => [200, { batch: null }],
    'GET /materials': () => [200, [sc14]],
    'GET /pour-plans': () => [200, [plan]],
    [`GET /materials/${sc14.id}/documents`]: () => [200, [sds]],
    [`GET /lots?materialId=${sc14.id}`]: () => [200, sc14Lots],
    'GET /benches': () => [200, []],
    ...handlers,
  });
  setSession(signInAnswer({ name: 'Joss Whitcombe', role: 'operator' }, { id: 'bench-1' }));
  renderRoutes(routes, '/bench');
  return requests;
}

describe('pour plans and the tools without a scale at the bench', { timeout: 20_000 }, () => {
  it('starts a batch from a pour plan: no amount step, the SDS one touch away', async () => {
    const requests = openBench({ 'POST /batches': () => [201, batchFixture()] });
    const plans = await screen.findByRole('list', { name: 'Pour plans' });
    const card = within(plans).getByRole('button', { name: /Pump housing, back half/ });
    expect(card).toHaveTextContent('165.0 g');
    expect(card).toHaveTextContent('total updated: the material changed');
    await user.click(card);
    // Straight to the lots: the plan gives the total.
    await user.click(await screen.findByRole('button', { name: 'Next: prepare' }));
    const link = await screen.findByRole('link', { name: 'Open the safety data sheet (PDF)' });
    expect(link).toHaveAttribute('href', sds.openUrl);
    expect(link).toHaveAttribute('target', '_blank');
    await user.click(screen.getByRole('button', { name: 'Skip stirring…' }));
    await user.click(screen.getByRole('button', { name: 'Yes, skip: it is stirred' }));
    await user.click(screen.getByRole('button', { name: 'Start weighing' }));
    await screen.findByRole('heading', { name: /Weigh Part A/ });
    const start = requests.find((r) => r.method === 'POST' && r.path === '/batches');
    // The hub takes the plan's material and total, recomputed if the material changed.
    expect(start?.body).toEqual({ benchId: 'bench-1', planId: 'plan-1', lots: [] });
  });

  it('shows fill marks and pump strokes in the "No scale here" mode of the amount step', async () => {
    openBench();
    await user.click(await screen.findByRole('button', { name: /Grey surface-coat epoxy SC-14/ }));
    await user.type(screen.getByRole('textbox', { name: 'Total mass to mix' }), '114');
    await user.click(screen.getByRole('button', { name: 'No scale here' }));
    await screen.findByRole('list', { name: 'Fill marks' });
    // Straight cup, 10 cm across: 100 g of resin at SG 1.65 = 60.61 cm³ over π × 5² = 78.54 cm²
    // is 0.77 cm; with 14 g of hardener (69.09 cm³ in all) 0.88 cm (V / (π r²), a cylinder).
    for (const [label, value] of [
      ['Bottom diameter', '10'],
      ['Top diameter', '10'],
      ['Usable height', '12'],
    ] as const) {
      const box = screen.getByRole('textbox', { name: label });
      await user.clear(box);
      await user.type(box, value);
    }
    // A cleared box shows its problem in place of the marks: the list is drawn anew.
    const marks = screen.getByRole('list', { name: 'Fill marks' });
    expect(marks).toHaveTextContent('Fill Resin up to 0.8 cm');
    expect(marks).toHaveTextContent('Fill Hardener up to 0.9 cm');
    // 100 g at 7.3 g a stroke: 13.7 strokes, 14 whole ones give 102.2 g.
    await user.type(screen.getByRole('textbox', { name: 'Resin: grams per stroke' }), '7.3');
    expect(screen.getByText(/14 strokes/).closest('p')).toHaveTextContent(
      '14 strokes for 100.0 g: they give 102.2 g',
    );
  });
});
