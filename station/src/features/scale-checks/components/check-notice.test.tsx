import type { BenchCheckStatus } from '@tareline/protocol/scale-checks';
import { screen } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { stubHub } from '../../../testing/fake-hub';
import { renderRoutes } from '../../../testing/render';
import { CheckLink, CheckNotice } from './check-notice';

const quiet: BenchCheckStatus = {
  benchId: 'bench-1',
  checkEveryHours: 8,
  blockWhenDue: false,
  checkToleranceG: null,
  calibrationDueOn: '2026-11-30',
  calibrationOverdue: false,
  due: false,
  reason: null,
  message: null,
  blocked: false,
  lastPassedAt: '2026-12-04T07:00:00.000Z',
  nextDueAt: '2026-12-04T15:00:00.000Z',
  repeatabilitySdG: null,
  repeatabilityAt: null,
  minNetG: null,
  minNetBandPct: null,
  runningCheckId: null,
};

function at(status: BenchCheckStatus) {
  stubHub({ 'GET /benches/bench-1/check-status': () => [200, status] });
  renderRoutes(
    [
      {
        path: '*',
        element: (
          <>
            <CheckNotice benchId="bench-1" />
            <CheckLink benchId="bench-1" />
          </>
        ),
      },
    ],
    '/bench',
  );
}

describe('the scale check notice at sign-in', () => {
  it('says a check is due, and leads to it', async () => {
    at({
      ...quiet,
      due: true,
      reason: 'expired',
      message: 'A scale check is due at this bench: the last one passed more than 8 h ago',
    });
    expect(await screen.findByRole('status')).toHaveTextContent(
      'A scale check is due at this bench: the last one passed more than 8 h ago.',
    );
    expect(screen.getByRole('link', { name: 'Check the scale now' })).toHaveAttribute(
      'href',
      '/bench/bench-1/checks',
    );
    // The notice's own button is the one way to the check then.
    expect(screen.getAllByRole('link')).toHaveLength(1);
  });

  it('names an overdue calibration date', async () => {
    at({ ...quiet, calibrationOverdue: true });
    expect(await screen.findByRole('status')).toHaveTextContent(
      'calibration was due on 2026-11-30',
    );
  });

  it('shows only the way to a check when nothing is due', async () => {
    at(quiet);
    expect(
      await screen.findByRole('link', { name: 'Check the scale with a reference weight' }),
    ).toBeInTheDocument();
    expect(screen.queryByRole('status')).not.toBeInTheDocument();
  });
});
