import type { Batch } from '@tareline/protocol';
import { screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it } from 'vitest';
import { routes } from '../../../app/router';
import { setSession } from '../../../lib/auth';
import { signInAnswer, stubHub } from '../../../testing/fake-hub';
import { savedBatch } from '../../../testing/fixtures';
import { renderRoutes } from '../../../testing/render';

// Review shows what the hub sent; the lot warning is the hub's own words.
function batch(overrides: Partial<Batch> = {}): Batch {
  return savedBatch({
    id: 12,
    operator: { id: 'p-joss', name: 'Joss Whitcombe' },
    totalMassG: 114,
    parts: [
      { label: 'Part A', targetG: 100, actualG: 100.0 },
      { label: 'Part B', targetG: 14, actualG: 14.1 },
    ],
    lots: [
      {
        part: 1,
        code: 'SC14H-2511',
        lotId: 'l-2',
        warnings: [{ code: 'LOT_EXPIRED', message: 'Lot SC14H-2511 expired on 2026-11-30' }],
      },
    ],
    // In the order the hub's JSON column may give them back: not the order they happened.
    steps: {
      saved: '2026-12-02T08:02:00.000Z',
      created: '2026-12-02T08:00:00.000Z',
      confirmedB: '2026-12-02T08:02:00.000Z',
      'interrupted.2': '2026-12-02T08:01:40.000Z',
      confirmedA: '2026-12-02T08:01:00.000Z',
      interrupted: '2026-12-02T08:01:20.000Z',
    },
    ...overrides,
  });
}

/** A page of the batch list as the hub answers it. */
const page = (items: Batch[]) => ({
  items: items.map(({ trace: _t, active: _a, rescue: _r, ...b }) => ({
    ...b,
    disposition: null,
    benchName: null,
  })),
  nextCursor: null,
});

afterEach(() => setSession(null));

describe('batch review', () => {
  it('lists batches with their outcome and filters by state', async () => {
    setSession(signInAnswer({ name: 'Ilse Varga', role: 'lead' }));
    const requests = stubHub({
      'GET /batches?limit=200': () => [
        200,
        page([
          batch(),
          batch({ id: 11, verdict: 'NO-GO', ratioDeviationPct: 2.5 }),
          batch({ id: 10, state: 'abandoned', verdict: null, ratioDeviationPct: null }),
        ]),
      ],
      'GET /batches?state=abandoned&limit=200': () => [
        200,
        page([batch({ id: 10, state: 'abandoned', verdict: null, ratioDeviationPct: null })]),
      ],
    });
    renderRoutes(routes, '/review/batches');
    const rows = await screen.findAllByRole('row');
    expect(rows).toHaveLength(4);
    expect(within(rows[1]!).getByText('GO')).toBeInTheDocument();
    expect(within(rows[1]!).getByText('+0.71 %')).toBeInTheDocument();
    expect(within(rows[2]!).getByText('NO-GO')).toBeInTheDocument();
    expect(within(rows[3]!).getByText('Abandoned')).toBeInTheDocument();

    await userEvent.selectOptions(screen.getByLabelText('Show'), 'abandoned');
    await screen.findByText('Abandoned');
    expect(await screen.findAllByRole('row')).toHaveLength(2);
    expect(requests.map((r) => r.path)).toContain('/batches?state=abandoned&limit=200');
  });

  it('shows one batch: parts as weighed, lot warnings, deviation against the band, the trace', async () => {
    setSession(signInAnswer({ name: 'Joss Whitcombe', role: 'operator' }, { id: 'bench-1' }));
    stubHub({
      'GET /batches/12': () => [
        200,
        batch({
          handledBy: [
            {
              id: 'p-priya',
              name: 'Priya Sandell',
              role: 'operator',
              at: '2026-12-02T08:01:30.000Z',
            },
          ],
          trace: [
            [0, 0],
            [1000, 50],
            [2000, 100],
            [3000, 0],
            [4000, 14.1],
          ],
        }),
      ],
    });
    renderRoutes(routes, '/review/batches/12');
    expect(await screen.findByRole('heading', { name: 'Batch 12' })).toBeInTheDocument();
    // Handed over mid-batch: both people are named.
    expect(screen.getByText(/^Priya Sandell \(operator, from /)).toBeInTheDocument();
    const partB = screen.getByRole('row', { name: /Part B/ });
    expect(within(partB).getByText('14.00 g')).toBeInTheDocument();
    expect(within(partB).getByText('14.10 g')).toBeInTheDocument();
    expect(within(partB).getByText('Lot SC14H-2511 expired on 2026-11-30')).toBeInTheDocument();
    expect(screen.getByText('+0.71 % (tolerance ±1 %)')).toBeInTheDocument();
    expect(
      screen.getByRole('img', { name: /5 readings over 4 s, highest 100\.0 g/ }),
    ).toBeInTheDocument();
    const steps = within(screen.getByRole('region', { name: 'Steps' })).getAllByRole('listitem');
    const stepName = (li: HTMLElement) =>
      li.textContent!.slice(li.querySelector('time')!.textContent!.length);
    expect(steps.map(stepName)).toEqual([
      'Started',
      'Part A done',
      'Interrupted',
      'Interrupted again',
      'Part B done',
      'Saved',
    ]);
  });

  it('says so when the batch does not exist', async () => {
    setSession(signInAnswer({ name: 'Ilse Varga', role: 'lead' }));
    stubHub({ 'GET /batches/99': () => [404, { message: 'No batch 99', errors: [] }] });
    renderRoutes(routes, '/review/batches/99');
    expect(await screen.findByRole('alert')).toHaveTextContent(
      'Batch 99 cannot be shown: No batch 99',
    );
  });
});
