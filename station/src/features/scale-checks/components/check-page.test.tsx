import type { BenchCheckStatus, ScaleCheck } from '@tareline/protocol/scale-checks';
import { screen } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { setSession } from '../../../lib/auth';
import { signInAnswer, stubHub } from '../../../testing/fake-hub';
import { renderRoutes } from '../../../testing/render';
import { CheckPage } from './check-page';

function status(over: Partial<BenchCheckStatus> = {}): BenchCheckStatus {
  return {
    benchId: 'bench-1',
    checkEveryHours: 8,
    blockWhenDue: true,
    checkToleranceG: null,
    calibrationDueOn: '2027-03-01',
    calibrationOverdue: false,
    due: true,
    reason: 'last-failed',
    message:
      'The last scale check at this bench failed: it read 200.5 g for the 200 g weight. Check the scale before weighing. Batches wait until a check passes',
    blocked: true,
    lastPassedAt: null,
    nextDueAt: null,
    repeatabilitySdG: null,
    repeatabilityAt: null,
    minNetG: null,
    minNetBandPct: null,
    runningCheckId: null,
    ...over,
  };
}

function check(over: Partial<ScaleCheck> = {}): ScaleCheck {
  return {
    id: 5,
    benchId: 'bench-1',
    kind: 'routine',
    state: 'waiting',
    step: 'zeroing',
    referenceG: 200,
    readabilityG: 0.01,
    toleranceG: 0.2,
    readingG: null,
    errorG: null,
    readings: [],
    placementsNeeded: 1,
    sdG: null,
    sdUsedG: null,
    bandPct: null,
    minNetG: null,
    note: null,
    by: { id: 'p-joss', name: 'Joss Whitcombe' },
    startedAt: '2026-12-04T09:00:00.000Z',
    finishedAt: null,
    ...over,
  };
}

/** Joss at bench 1, on the check page, with the hub answering each GET of check 5 in turn. */
function openCheckPage(answers: ScaleCheck[], history: ScaleCheck[] = []) {
  setSession(signInAnswer({ name: 'Joss Whitcombe', role: 'operator' }, { id: 'bench-1' }));
  let asked = 0;
  const requests = stubHub({
    'GET /benches': () => [200, []],
    'GET /benches/bench-1/check-status': () => [200, status()],
    'GET /benches/bench-1/checks': () => [200, history],
    'POST /benches/bench-1/checks': () => [201, { id: 5, state: 'waiting' }],
    'GET /benches/bench-1/checks/5': () => [200, answers[Math.min(asked++, answers.length - 1)]],
  });
  renderRoutes(
    [{ path: '/bench/:benchId/checks', element: <CheckPage /> }],
    '/bench/bench-1/checks',
  );
  return requests;
}

describe('the scale check page', () => {
  it('guides a routine check: zeroing, place the weight, then the hub’s reading and the result', async () => {
    const requests = openCheckPage([
      check(),
      check({ step: 'place' }),
      check({ step: 'place' }),
      check({
        state: 'passed',
        step: null,
        readingG: 200.01,
        errorG: 0.01,
        finishedAt: '2026-12-04T09:00:05.000Z',
      }),
    ]);
    // The bench says why a check is wanted.
    expect(await screen.findByText(/last scale check at this bench failed/)).toBeInTheDocument();
    await userEvent.type(screen.getByLabelText('Reference weight'), '200');
    await userEvent.click(screen.getByRole('button', { name: 'Start the check' }));

    expect(
      await screen.findByText('Keep the pan clear: the hub is zeroing it'),
    ).toBeInTheDocument();
    expect(
      await screen.findByText('Place the 200.00 g weight on the pan', {}, { timeout: 3000 }),
    ).toBeInTheDocument();
    expect(await screen.findByText('Passed', {}, { timeout: 3000 })).toBeInTheDocument();
    expect(screen.getByText('Read 200.01 g, error +0.01 g (±0.20 g allowed)')).toBeInTheDocument();
    expect(requests.find((r) => r.method === 'POST')?.body).toEqual({
      kind: 'routine',
      referenceG: 200,
    });
    // Nothing typed but the weight's mass: the reading is the hub's.
    expect(screen.getByRole('button', { name: 'Run another check' })).toBeInTheDocument();
  });

  it('says a failed check failed, by how much, and not to weigh on the scale', async () => {
    openCheckPage([
      check({ state: 'failed', step: null, readingG: 200.5, errorG: 0.5, note: 'x' }),
    ]);
    await userEvent.type(await screen.findByLabelText('Reference weight'), '200');
    await userEvent.click(screen.getByRole('button', { name: 'Start the check' }));
    expect(await screen.findByText('Failed')).toBeInTheDocument();
    expect(
      screen.getByText(
        /Read 200\.50 g for the 200\.00 g weight: error \+0\.50 g, more than the ±0\.20 g allowed/,
      ),
    ).toBeInTheDocument();
    expect(screen.getByText(/Do not weigh on this scale/)).toBeInTheDocument();
  });

  it('counts the placements of a repeatability test and says when to lift the weight', async () => {
    const requests = openCheckPage([
      check({
        kind: 'repeatability',
        step: 'lift',
        toleranceG: null,
        placementsNeeded: 10,
        readings: [100, 100.01, 99.99],
      }),
    ]);
    await userEvent.click(await screen.findByLabelText(/Repeatability test/));
    await userEvent.type(screen.getByLabelText('Reference weight'), '100');
    await userEvent.click(screen.getByRole('button', { name: 'Start the check' }));
    expect(await screen.findByText('Lift the weight off the pan')).toBeInTheDocument();
    expect(screen.getByText(/3 of 10 placements read/)).toBeInTheDocument();
    expect(screen.getByText('Readings: 100.00 g, 100.01 g, 99.99 g')).toBeInTheDocument();
    expect(requests.find((r) => r.method === 'POST')?.body).toEqual({
      kind: 'repeatability',
      referenceG: 100,
    });
  });

  it('names a missing weight before asking the hub, and shows the record', async () => {
    const requests = openCheckPage(
      [],
      [
        check({
          state: 'failed',
          step: null,
          readingG: 200.5,
          errorG: 0.5,
          finishedAt: '2026-12-04T09:00:05.000Z',
        }),
      ],
    );
    await userEvent.click(await screen.findByRole('button', { name: 'Start the check' }));
    expect(await screen.findByText('A reference weight weighs more than 0 g')).toBeInTheDocument();
    expect(requests.filter((r) => r.method === 'POST')).toEqual([]);
    expect(await screen.findByRole('cell', { name: 'Failed' })).toBeInTheDocument();
    expect(screen.getByRole('cell', { name: 'Joss Whitcombe' })).toBeInTheDocument();
    expect(screen.getByText('2027-03-01')).toBeInTheDocument();
  });
});
