import type { AccuracyRow } from '@tareline/protocol';
import { screen } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it } from 'vitest';
import { routes } from '../../../app/router';
import { setSession } from '../../../lib/auth';
import { signInAnswer, stubHub } from '../../../testing/fake-hub';
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
});
