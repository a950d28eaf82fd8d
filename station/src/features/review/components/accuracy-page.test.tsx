import type { AccuracyRow } from '@tareline/protocol';
import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it } from 'vitest';
import { routes } from '../../../app/router';
import { setSession } from '../../../lib/auth';
import { signInAnswer, stubHub } from '../../../testing/fake-hub';
import { drawnCharts } from '../../../testing/fake-uplot';
import { renderRoutes } from '../../../testing/render';

const row = (over: Partial<AccuracyRow>): AccuracyRow => ({
  groupId: 'p-wren',
  groupName: 'Wren Ashby',
  bucketStart: '2026-11-23T00:00:00.000Z',
  count: 12,
  goShare: 0.75,
  meanDeviationPct: 0.31,
  sdDeviationPct: 0.42,
  p95AbsDeviationPct: 0.9,
  rescues: 1,
  ...over,
});

afterEach(() => setSession(null));

describe('accuracy over time', () => {
  it('shows each operator by week, the one furthest off ratio first', async () => {
    setSession(signInAnswer({ name: 'Ilse Varga', role: 'lead' }));
    const requests = stubHub({
      'GET /accuracy?groupBy=operator&bucket=week': () => [
        200,
        {
          groupBy: 'operator',
          bucket: 'week',
          rows: [
            row({}),
            row({ bucketStart: '2026-11-30T00:00:00.000Z', p95AbsDeviationPct: 0.5 }),
            row({ groupId: 'p-joss', groupName: 'Joss Whitcombe', p95AbsDeviationPct: 1.8 }),
          ],
        },
      ],
      'GET /accuracy?groupBy=operator&bucket=day': () => [
        200,
        { groupBy: 'operator', bucket: 'day', rows: [] },
      ],
    });
    renderRoutes(routes, '/review/accuracy?groupBy=operator');
    const groups = await screen.findAllByRole('rowheader');
    expect(groups.map((g) => g.textContent)).toEqual(['Joss Whitcombe', 'Wren Ashby']);
    expect(screen.getByText('±1.80 %')).toBeInTheDocument();
    expect(screen.getAllByText('75 %')).toHaveLength(3);

    await userEvent.selectOptions(screen.getByLabelText('By'), 'day');
    expect(await screen.findByText('No saved batches yet.')).toBeInTheDocument();
    expect(requests.map((r) => r.path)).toContain('/accuracy?groupBy=operator&bucket=day');
  });

  it('charts each group with its spread shaded, and orders by GO share on request', async () => {
    setSession(signInAnswer({ name: 'Ilse Varga', role: 'lead' }));
    drawnCharts.length = 0;
    stubHub({
      'GET /accuracy?groupBy=bench&bucket=week': () => [
        200,
        {
          groupBy: 'bench',
          bucket: 'week',
          rows: [
            // Narrow spread but more NO-GO: last by p95, first by GO share.
            row({ groupId: 'bench-1', groupName: 'Front bench', goShare: 0.5, count: 10 }),
            row({
              groupId: 'bench-2',
              groupName: 'Casting bench',
              bucketStart: '2026-11-30T00:00:00.000Z',
              goShare: 0.9,
              p95AbsDeviationPct: 1.4,
            }),
            row({ groupId: 'bench-2', groupName: 'Casting bench', goShare: 1, count: 4 }),
          ],
        },
      ],
    });
    renderRoutes(routes, '/review/accuracy?groupBy=bench');
    const names = async () => (await screen.findAllByRole('rowheader')).map((g) => g.textContent);
    expect(await names()).toEqual(['Casting bench', 'Front bench']);
    await waitFor(() => expect(drawnCharts).toHaveLength(2));
    // Casting bench, oldest week first: mean 0.31 % ± SD 0.42 % shaded between series 2 and 3.
    const casting = drawnCharts[0]!;
    expect(casting.data[0]).toEqual([
      Date.parse('2026-11-23T00:00:00Z') / 1000,
      Date.parse('2026-11-30T00:00:00Z') / 1000,
    ]);
    expect(casting.data[2]![0]).toBeCloseTo(0.73, 6);
    expect(casting.data[3]![0]).toBeCloseTo(-0.11, 6);
    expect(casting.data[4]).toEqual([0.9, 1.4]);
    expect(casting.options.bands).toEqual([expect.objectContaining({ series: [2, 3] })]);

    await userEvent.selectOptions(screen.getByLabelText('Worst first by'), 'goShare');
    await waitFor(async () => expect(await names()).toEqual(['Front bench', 'Casting bench']));
  });
});
