import { screen, within } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { routes } from '../../../app/router';
import { setSession } from '../../../lib/auth';
import { signInAnswer, stubHub } from '../../../testing/fake-hub';
import { openedSockets } from '../../../testing/fake-live-socket';
import { batchFixture, partBFixture, pourFixture } from '../../../testing/live-fixtures';
import { renderRoutes } from '../../../testing/render';

vi.mock('socket.io-client', () =>
  import('../../../testing/fake-live-socket').then((m) => m.fakeSocketIo),
);

const bench = (id: string, name: string) => ({
  id,
  name,
  pinRequired: false,
  idleSignOutMin: 5,
  scale: { benchId: id, state: 'online', detail: '', readabilityG: 0.01, transport: 'simulated' },
});

afterEach(() => {
  openedSockets.length = 0;
});

describe('benches overview', () => {
  it('shows every bench live: scale state, who weighs, the batch and its verdict', async () => {
    setSession(signInAnswer({ name: 'Ilse Varga', role: 'lead' }));
    stubHub({
      'GET /benches': () => [
        200,
        [bench('bench-1', 'Front bench'), bench('bench-2', 'Casting bench')],
      ],
      'GET /batches/current?benchId=bench-1': () => [200, { batch: batchFixture() }],
      'GET /batches/current?benchId=bench-2': () => [200, { batch: null }],
    });
    renderRoutes(routes, '/review/benches');
    const front = await screen.findByRole('listitem', { name: 'Front bench' });
    const casting = screen.getByRole('listitem', { name: 'Casting bench' });
    expect(await within(front).findByText('Joss Whitcombe')).toBeInTheDocument();
    expect(within(front).getByText('weighing part A')).toBeInTheDocument();
    expect(within(casting).getByText('No batch yet.')).toBeInTheDocument();

    // One socket a bench, each with the lead's token.
    const socketOf = (id: string) =>
      openedSockets.find((s) => (s.options as { query: { benchId: string } }).query.benchId === id)!
        .socket;
    expect(openedSockets).toHaveLength(2);
    expect(openedSockets[0]!.options).toMatchObject({ auth: { token: 'token-of-Ilse-Varga' } });
    socketOf('bench-2').fire('connect');
    socketOf('bench-2').fire('scaleStatus', {
      benchId: 'bench-2',
      state: 'offline',
      detail: 'No answer on /dev/ttyUSB0',
    });
    expect(within(casting).getByText('Scale offline')).toBeInTheDocument();

    socketOf('bench-1').fire('batch', { benchId: 'bench-1', batch: partBFixture() });
    socketOf('bench-1').fire('pour', pourFixture({ verdict: 'OVER', netG: 14.6 }));
    expect(within(front).getByText('weighing part B')).toBeInTheDocument();
    expect(within(front).getByText(/14\.60 g: over/)).toBeInTheDocument();

    socketOf('bench-1').fire('batch', {
      benchId: 'bench-1',
      batch: partBFixture({ state: 'saved', verdict: 'NO-GO' }),
    });
    expect(within(front).getByText('NO-GO')).toBeInTheDocument();
    expect(within(front).queryByText(/: over/)).toBeNull();

    // Who is signed in at each bench, as the hub tells it; another bench's event is ignored.
    socketOf('bench-1').fire('presence', {
      benchId: 'bench-1',
      people: [{ id: 'p-joss', name: 'Joss Whitcombe' }],
    });
    socketOf('bench-2').fire('presence', { benchId: 'bench-2', people: [] });
    socketOf('bench-2').fire('presence', {
      benchId: 'bench-1',
      people: [{ id: 'p-tomas', name: 'Tomas Reyl' }],
    });
    expect(within(front).getByText(/Signed in:/)).toHaveTextContent('Signed in: Joss Whitcombe');
    expect(within(casting).getByText('Nobody signed in at the bench')).toBeInTheDocument();
  });
});
