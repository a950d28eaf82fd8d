import type { Batch } from '@tareline/protocol';
import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { routes } from '../../../app/router';
import { getSession, setSession } from '../../../lib/auth';
import { signInAnswer, stubHub } from '../../../testing/fake-hub';
import { savedBatch } from '../../../testing/fixtures';
import { drawnCharts } from '../../../testing/fake-uplot';
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
  items: items.map(({ trace: _t, active: _a, rescue: _r, dispositions: _d, ...b }) => ({
    ...b,
    disposition: null,
    benchName: b.benchId === 'bench-1' ? 'Front bench' : null,
  })),
  nextCursor: null,
});

/** What the filters offer: the hub's materials and benches. */
const OPTIONS = {
  'GET /materials': () => [200, []] as [number, unknown],
  'GET /benches': () => [200, []] as [number, unknown],
};

afterEach(() => {
  setSession(null);
  vi.unstubAllGlobals();
});

describe('batch review', () => {
  it('lists batches: bench names, weighed totals, outcome, no deviation when abandoned', async () => {
    setSession(signInAnswer({ name: 'Ilse Varga', role: 'lead' }));
    const requests = stubHub({
      ...OPTIONS,
      'GET /batches?limit=50': () => [
        200,
        page([
          batch(),
          batch({ id: 11, verdict: 'NO-GO', ratioDeviationPct: 2.5 }),
          batch({
            id: 10,
            state: 'abandoned',
            verdict: null,
            // What an abandoned batch kept of its last judgement says nothing of the ratio.
            ratioDeviationPct: 3.1,
            parts: [
              { label: 'Part A', targetG: 100, actualG: 100 },
              { label: 'Part B', targetG: 14, actualG: null },
            ],
          }),
        ]),
      ],
      'GET /batches?state=abandoned&limit=50': () => [
        200,
        page([batch({ id: 10, state: 'abandoned', verdict: null, ratioDeviationPct: null })]),
      ],
    });
    renderRoutes(routes, '/review/batches');
    const rows = await screen.findAllByRole('row');
    expect(rows).toHaveLength(4);
    expect(within(rows[1]!).getByText('GO')).toBeInTheDocument();
    expect(within(rows[1]!).getByText('+0.71 %')).toBeInTheDocument();
    expect(within(rows[1]!).getByText('Front bench')).toBeInTheDocument();
    expect(within(rows[1]!).getByText('114.10 g / 114.00 g')).toBeInTheDocument();
    expect(within(rows[1]!).getByText('to decide')).toBeInTheDocument();
    expect(within(rows[2]!).getByText('NO-GO')).toBeInTheDocument();
    expect(within(rows[3]!).getByText('Abandoned')).toBeInTheDocument();
    expect(within(rows[3]!).getByText('100.00 g / 114.00 g')).toBeInTheDocument();
    expect(within(rows[3]!).queryByText(/%/)).toBeNull();

    await userEvent.selectOptions(screen.getByLabelText('State'), 'abandoned');
    await waitFor(() => expect(screen.getAllByRole('row')).toHaveLength(2));
    expect(requests.map((r) => r.path)).toContain('/batches?state=abandoned&limit=50');
  });

  it('takes the filters from the address, sorts by a click, loads more by cursor', async () => {
    setSession(signInAnswer({ name: 'Ilse Varga', role: 'lead' }));
    const requests = stubHub({
      ...OPTIONS,
      'GET /batches?lot=SC14H-2511&verdict=NO-GO&limit=50': () => [
        200,
        { ...page([batch({ id: 11, verdict: 'NO-GO' })]), nextCursor: 'c1' },
      ],
      'GET /batches?lot=SC14H-2511&verdict=NO-GO&cursor=c1&limit=50': () => [
        200,
        page([batch({ id: 7, verdict: 'NO-GO' })]),
      ],
      'GET /batches?lot=SC14H-2511&verdict=NO-GO&sort=-absDeviation&limit=50': () => [
        200,
        page([batch({ id: 7, verdict: 'NO-GO' }), batch({ id: 11, verdict: 'NO-GO' })]),
      ],
      'GET /batches?lot=SC14H-2511&verdict=NO-GO&sort=absDeviation&limit=50': () => [
        200,
        page([batch({ id: 11, verdict: 'NO-GO' }), batch({ id: 7, verdict: 'NO-GO' })]),
      ],
    });
    const { router } = renderRoutes(routes, '/review/batches?verdict=NO-GO&lot=SC14H-2511');
    expect(await screen.findByRole('link', { name: '11' })).toBeInTheDocument();
    expect(screen.getByLabelText('Verdict')).toHaveValue('NO-GO');
    expect(screen.getByLabelText('Lot code')).toHaveValue('SC14H-2511');

    // A link reproduces the view: the filters come from the address.
    expect(screen.getByText('Page 1')).toBeInTheDocument();
    expect(screen.getByRole('button', { name: 'Previous page' })).toBeDisabled();

    await userEvent.click(screen.getByRole('button', { name: 'Next page' }));
    expect(await screen.findByRole('link', { name: '7' })).toBeInTheDocument();
    expect(screen.queryByRole('link', { name: '11' })).toBeNull();
    expect(screen.getByText('Page 2')).toBeInTheDocument();
    expect(screen.getByRole('button', { name: 'Next page' })).toBeDisabled();

    await userEvent.click(screen.getByRole('button', { name: 'Previous page' }));
    expect(await screen.findByRole('link', { name: '11' })).toBeInTheDocument();
    expect(screen.queryByRole('link', { name: '7' })).toBeNull();
    expect(screen.getByText('Page 1')).toBeInTheDocument();

    await userEvent.click(screen.getByRole('button', { name: 'Off ratio' }));
    await waitFor(() =>
      expect(screen.getByRole('columnheader', { name: /Off ratio/ })).toHaveAttribute(
        'aria-sort',
        'descending',
      ),
    );
    expect(router.state.location.search).toBe('?verdict=NO-GO&lot=SC14H-2511&sort=-absDeviation');
    await userEvent.click(screen.getByRole('button', { name: /Off ratio/ }));
    await waitFor(() =>
      expect(screen.getByRole('columnheader', { name: /Off ratio/ })).toHaveAttribute(
        'aria-sort',
        'ascending',
      ),
    );
    expect(requests.map((r) => r.path)).toContain(
      '/batches?lot=SC14H-2511&verdict=NO-GO&sort=absDeviation&limit=50',
    );
  });

  it('shows NO-GO batches nobody decided on in the "to decide" view, and the export follows', async () => {
    setSession(signInAnswer({ name: 'Ilse Varga', role: 'lead' }));
    stubHub({
      ...OPTIONS,
      'GET /batches?limit=50': () => [200, page([batch(), batch({ id: 11, verdict: 'NO-GO' })])],
      'GET /batches?verdict=NO-GO&state=saved&disposition=none&limit=50': () => [
        200,
        page([batch({ id: 11, verdict: 'NO-GO' })]),
      ],
    });
    const { router } = renderRoutes(routes, '/review/batches');
    expect(await screen.findByRole('link', { name: '12' })).toBeInTheDocument();
    await userEvent.click(screen.getByRole('link', { name: 'To decide' }));
    await waitFor(() => expect(screen.queryByRole('link', { name: '12' })).toBeNull());
    expect(screen.getByRole('link', { name: '11' })).toBeInTheDocument();
    expect(screen.getByRole('link', { name: 'To decide' })).toHaveAttribute('aria-current', 'page');
    expect(router.state.location.search).toBe('?verdict=NO-GO&state=saved&disposition=none');
    expect(screen.getByLabelText('Decision')).toHaveValue('none');
    expect(screen.getByRole('link', { name: 'Export CSV' })).toHaveAttribute(
      'href',
      '/api/batches/export.csv?verdict=NO-GO&state=saved&disposition=none',
    );
  });

  it('goes back to the first page when the order changes', async () => {
    setSession(signInAnswer({ name: 'Ilse Varga', role: 'lead' }));
    stubHub({
      ...OPTIONS,
      'GET /batches?limit=50': () => [200, { ...page([batch({ id: 12 })]), nextCursor: 'c1' }],
      'GET /batches?cursor=c1&limit=50': () => [200, page([batch({ id: 5 })])],
      'GET /batches?sort=createdAt&limit=50': () => [
        200,
        { ...page([batch({ id: 1 })]), nextCursor: 'c9' },
      ],
    });
    renderRoutes(routes, '/review/batches');
    await screen.findByRole('link', { name: '12' });
    await userEvent.click(screen.getByRole('button', { name: 'Next page' }));
    expect(await screen.findByRole('link', { name: '5' })).toBeInTheDocument();
    // Newest first is the default; a click on "Started" turns it to oldest first.
    expect(screen.getByRole('columnheader', { name: /Started/ })).toHaveAttribute(
      'aria-sort',
      'descending',
    );
    await userEvent.click(screen.getByRole('button', { name: /Started/ }));
    expect(await screen.findByRole('link', { name: '1' })).toBeInTheDocument();
    expect(screen.getByText('Page 1')).toBeInTheDocument();
    expect(screen.getByRole('columnheader', { name: /Started/ })).toHaveAttribute(
      'aria-sort',
      'ascending',
    );
  });

  it('exports the CSV of the filter shown, with the session token', async () => {
    setSession(signInAnswer({ name: 'Ilse Varga', role: 'lead' }));
    const requests = stubHub({
      ...OPTIONS,
      'GET /batches?verdict=NO-GO&limit=50': () => [200, page([batch({ id: 11 })])],
      'GET /batches/export.csv?verdict=NO-GO': () => [200, 'number\r\n11\r\n'],
    });
    const createObjectURL = vi.fn(() => 'blob:batches');
    vi.stubGlobal('URL', Object.assign(URL, { createObjectURL, revokeObjectURL: vi.fn() }));
    renderRoutes(routes, '/review/batches?verdict=NO-GO');
    await screen.findByRole('link', { name: '11' });
    const link = screen.getByRole('link', { name: 'Export CSV' });
    expect(link).toHaveAttribute('href', '/api/batches/export.csv?verdict=NO-GO');
    await userEvent.click(link);
    await waitFor(() => expect(createObjectURL).toHaveBeenCalledTimes(1));
    const exported = requests.find((r) => r.path.startsWith('/batches/export.csv'))!;
    expect(exported.path).toBe('/batches/export.csv?verdict=NO-GO');
    expect(exported.token).toBeTruthy();
  });

  it('lets a lead hold a batch with a reason, signed by password, and shows the history', async () => {
    const lead = signInAnswer({ name: 'Ilse Varga', role: 'lead' });
    setSession(lead);
    const held = {
      decision: 'hold' as const,
      reason: 'Ratio out of band',
      by: { id: 'p-ilse', name: 'Ilse Varga' },
      at: '2026-12-02T09:00:00.000Z',
    };
    const requests = stubHub({
      'GET /batches/12': () => [
        200,
        batch({ verdict: 'NO-GO', disposition: null, dispositions: [] }),
      ],
      'GET /audit?entity=batch&entityId=12&limit=200': () => [
        200,
        {
          items: [
            {
              id: 3,
              at: '2026-12-02T08:02:00.000Z',
              actor: null,
              entity: 'batch',
              entityId: '12',
              action: 'state.saved',
              data: { state: 'saved' },
              prevHash: '0'.repeat(64),
              hash: 'ab12cd34ef56'.padEnd(64, '0'),
            },
          ],
          nextCursor: null,
        },
      ],
      'POST /batches/12/dispositions': (req) =>
        (req.body as { password: string }).password === 'ridge-lead-demo'
          ? [201, batch({ verdict: 'NO-GO', disposition: 'hold', dispositions: [held] })]
          : [
              401,
              {
                message: 'Password not recognised: the decision is not signed',
                errors: [{ path: 'password', message: 'Password not recognised' }],
              },
            ],
    });
    renderRoutes(routes, '/review/batches/12');
    const panel = await screen.findByRole('region', { name: 'Decision' });
    expect(within(panel).getByText('Not decided yet.')).toBeInTheDocument();
    const trail = await screen.findByRole('region', { name: 'Audit trail' });
    expect(await within(trail).findByText(/state\.saved by the hub/)).toBeInTheDocument();
    expect(within(trail).getByText('#3 ab12cd34ef56')).toBeInTheDocument();

    // Holding asks for a reason before anything is sent.
    await userEvent.type(within(panel).getByLabelText('Your password'), 'wrong');
    await userEvent.click(within(panel).getByRole('button', { name: 'Sign decision' }));
    expect(await within(panel).findByText('Say why the batch is held')).toBeInTheDocument();
    expect(requests.filter((r) => r.method === 'POST')).toHaveLength(0);

    await userEvent.type(within(panel).getByLabelText(/^Reason/), 'Ratio out of band');
    await userEvent.click(within(panel).getByRole('button', { name: 'Sign decision' }));
    expect(await within(panel).findByRole('alert')).toHaveTextContent(
      'Password not recognised: the decision is not signed',
    );
    // A wrong signature does not sign the lead out.
    expect(getSession()).not.toBeNull();

    await userEvent.clear(within(panel).getByLabelText('Your password'));
    await userEvent.type(within(panel).getByLabelText('Your password'), 'ridge-lead-demo');
    await userEvent.click(within(panel).getByRole('button', { name: 'Sign decision' }));
    const history = await within(panel).findByRole('list', { name: 'Decisions' });
    expect(history).toHaveTextContent('On hold by Ilse Varga: Ratio out of band');
    // The trail is read again: the decision's entry shows without a reload.
    await waitFor(() =>
      expect(requests.filter((r) => r.path.startsWith('/audit'))).toHaveLength(2),
    );
    expect(requests.filter((r) => r.method === 'POST').at(-1)!.body).toEqual({
      decision: 'hold',
      reason: 'Ratio out of band',
      password: 'ridge-lead-demo',
    });
  });

  it('shows one batch: parts as weighed, lot warnings, deviation against the band, the trace', async () => {
    setSession(signInAnswer({ name: 'Joss Whitcombe', role: 'operator' }, { id: 'bench-1' }));
    const requests = stubHub({
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
    // The chart (uPlot, loaded on demand) draws each part's target and part B's band of ±1 %.
    await waitFor(() => expect(drawnCharts.length).toBeGreaterThan(0));
    const chart = drawnCharts.at(-1)!;
    expect(chart.options.series?.map((s) => s.label)).toEqual([
      'Seconds',
      'Net weight',
      'Part A target',
      'Part B target',
      'Part B high',
      'Part B low',
    ]);
    expect(chart.data[0]).toEqual([0, 1, 2, 3, 4]);
    // toleranceBand: 14 g ± 1 % (protocol/src/mix/targets.ts) is 13.86–14.14 g.
    expect(chart.data[4]![0]).toBeCloseTo(14.14, 6);
    expect(chart.data[5]![0]).toBeCloseTo(13.86, 6);
    expect(chart.options.bands).toEqual([expect.objectContaining({ series: [4, 5] })]);
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
    // An operator neither decides nor reads the audit trail.
    expect(screen.queryByRole('form', { name: 'Decide' })).toBeNull();
    expect(screen.queryByRole('region', { name: 'Audit trail' })).toBeNull();
    expect(requests.some((r) => r.path.startsWith('/audit'))).toBe(false);
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
