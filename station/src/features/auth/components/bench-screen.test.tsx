import { act, fireEvent, screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { routes } from '../../../app/router';
import { setSession } from '../../../lib/auth';
import { reportBenchActivity } from '../../../lib/bench-activity';
import { signInAnswer, stubHub } from '../../../testing/fake-hub';
import { renderRoutes } from '../../../testing/render';

const pinNeeded: [number, unknown] = [
  401,
  { message: 'Enter your PIN', errors: [{ path: 'pin', message: 'Enter your PIN' }] },
];

afterEach(() => {
  vi.useRealTimers();
});

describe('bench sign-in', () => {
  it('catches a badge reader typing anywhere, asks for the PIN on the pad, then signs in', async () => {
    const requests = stubHub({
      'POST /auth/badge': ({ body }) => {
        const { badge, pin } = body as { badge: string; pin?: string };
        if (badge !== 'HR-1001') return [500];
        if (pin === undefined) return pinNeeded;
        return pin === '1357'
          ? [200, signInAnswer({ name: 'Tomas Reyl', role: 'operator' }, { id: 'bench-1' })]
          : [401, { message: 'Badge or PIN not recognised', errors: [] }];
      },
    });
    renderRoutes(routes, '/bench');
    expect(await screen.findByRole('heading', { name: 'Scan your badge' })).toBeInTheDocument();

    // A reader types fast and presses Enter; no text box has the focus.
    expect(document.activeElement).toBe(document.body);
    await userEvent.keyboard('HR-1001{Enter}');

    const pad = await screen.findByRole('group', { name: 'PIN pad' });
    expect(screen.getByRole('heading', { name: 'Enter your PIN' })).toBeInTheDocument();
    for (const digit of ['1', '3', '5', '7']) {
      await userEvent.click(within(pad).getByRole('button', { name: digit }));
    }
    await userEvent.click(within(pad).getByRole('button', { name: 'OK' }));

    expect(await screen.findByText('Tomas Reyl', { selector: 'strong' })).toBeInTheDocument();
    expect(screen.getByRole('heading', { name: 'Bench' })).toBeInTheDocument();
    expect(screen.getByRole('button', { name: 'Switch person' })).toBeInTheDocument();
    // Signed in, the bench flow loads materials and the open batch too; these are the sign-ins.
    const signIns = requests.filter((r) => r.path.startsWith('/auth'));
    expect(signIns.map((r) => r.body)).toEqual([
      { benchId: 'bench-1', badge: 'HR-1001' },
      { benchId: 'bench-1', badge: 'HR-1001', pin: '1357' },
    ]);
  });

  it('ignores slow stray key presses: only a reader-speed burst counts as a scan', async () => {
    const requests = stubHub({});
    renderRoutes(routes, '/bench');
    await screen.findByRole('heading', { name: 'Scan your badge' });
    // About 200 ms between keys: a person leaning on the keyboard, not a reader.
    const user = userEvent.setup({ delay: 200 });
    await user.keyboard('HR-1001{Enter}');
    expect(requests).toEqual([]);
  });

  it('takes a badge code typed by hand and signs in a person without a PIN', async () => {
    stubHub({
      'POST /auth/badge': () => [
        200,
        signInAnswer({ name: 'Joss Whitcombe', role: 'operator' }, { id: 'bench-1' }),
      ],
    });
    renderRoutes(routes, '/bench');
    await userEvent.type(await screen.findByRole('textbox', { name: 'Badge code' }), 'HR-1003');
    await userEvent.click(screen.getByRole('button', { name: 'Sign in' }));
    expect(await screen.findByText('Joss Whitcombe', { selector: 'strong' })).toBeInTheDocument();
    // Who is signed in also shows in the header on every page.
    expect(screen.getByLabelText('Signed in')).toHaveTextContent('Joss Whitcombe (operator)');
  });

  it('says a wrong PIN or unknown badge was not recognised and waits for a new scan', async () => {
    stubHub({
      'POST /auth/badge': ({ body }) =>
        (body as { pin?: string }).pin === undefined
          ? pinNeeded
          : [401, { message: 'Badge or PIN not recognised', errors: [] }],
    });
    renderRoutes(routes, '/bench');
    await screen.findByRole('heading', { name: 'Scan your badge' });
    await userEvent.keyboard('ZZ-9999{Enter}');
    await screen.findByRole('group', { name: 'PIN pad' });
    await userEvent.keyboard('0000{Enter}');
    expect(await screen.findByRole('alert')).toHaveTextContent('Badge or PIN not recognised');
    expect(screen.getByRole('heading', { name: 'Scan your badge' })).toBeInTheDocument();
  });

  it('uses the bench named in the address', async () => {
    const requests = stubHub({ 'POST /auth/badge': () => pinNeeded });
    renderRoutes(routes, '/bench?bench=bench-2');
    await screen.findByText('This screen is bench-2.');
    await userEvent.keyboard('HR-1003{Enter}');
    await screen.findByRole('group', { name: 'PIN pad' });
    expect(requests[0]?.body).toMatchObject({ benchId: 'bench-2' });
  });

  it('gives the PIN pad keys of at least 56 px', async () => {
    stubHub({ 'POST /auth/badge': () => pinNeeded });
    renderRoutes(routes, '/bench');
    await screen.findByRole('heading', { name: 'Scan your badge' });
    await userEvent.keyboard('HR-1001{Enter}');
    const pad = await screen.findByRole('group', { name: 'PIN pad' });
    // jsdom lays nothing out, so check the size classes (Tailwind: h-20 = 80 px, min-h-14 = 56 px).
    for (const key of within(pad).getAllByRole('button', { name: /^\d$|OK|Erase/ })) {
      expect(key.className).toMatch(/\bmin-h-14\b/);
      expect(key.className).toMatch(/\bmin-w-14\b/);
    }
  });
});

describe('signed in at the bench', () => {
  it('"Switch person" signs out and leaves only the sign-in screen', async () => {
    const requests = stubHub({ 'POST /auth/logout': () => [204] });
    setSession(signInAnswer({ name: 'Priya Sandell', role: 'operator' }, { id: 'bench-1' }));
    renderRoutes(routes, '/bench');
    await userEvent.click(await screen.findByRole('button', { name: 'Switch person' }));
    expect(await screen.findByRole('heading', { name: 'Scan your badge' })).toBeInTheDocument();
    expect(screen.queryByText(/Priya Sandell/)).not.toBeInTheDocument();
    expect(requests.filter((r) => r.path.startsWith('/auth'))).toEqual([
      expect.objectContaining({
        method: 'POST',
        path: '/auth/logout',
        token: 'token-of-Priya-Sandell',
      }),
    ]);
  });

  it('counts down the last 30 s of idle time, then signs out; a touch starts it again', async () => {
    stubHub({ 'POST /auth/logout': () => [204] });
    vi.useFakeTimers({ toFake: ['setInterval', 'clearInterval', 'Date'] });
    setSession(
      signInAnswer({ name: 'Tomas Reyl', role: 'operator' }, { id: 'bench-1', idleSignOutMin: 1 }),
    );
    renderRoutes(routes, '/bench');
    await screen.findByText('Tomas Reyl', { selector: 'strong' });

    act(() => vi.advanceTimersByTime(29_000));
    expect(screen.queryByText(/Signing out in/)).not.toBeInTheDocument();
    act(() => vi.advanceTimersByTime(2_000));
    // By its words: the bench flow below may show alerts of its own (the faked hub has no
    // materials), depending on how fast its requests come back.
    expect(
      screen.getByText('Signing out in 29 s: touch the screen to stay signed in'),
    ).toHaveAttribute('role', 'alert');

    fireEvent.pointerDown(document.body);
    act(() => vi.advanceTimersByTime(1_000));
    expect(screen.queryByText(/Signing out in/)).not.toBeInTheDocument();

    // Hands busy pouring: the scale moving counts as someone at the bench.
    act(() => vi.advanceTimersByTime(40_000));
    expect(screen.getByText(/Signing out in \d+ s/)).toBeInTheDocument();
    act(() => reportBenchActivity());
    act(() => vi.advanceTimersByTime(1_000));
    expect(screen.queryByText(/Signing out in/)).not.toBeInTheDocument();

    act(() => vi.advanceTimersByTime(60_000));
    expect(await screen.findByRole('heading', { name: 'Scan your badge' })).toBeInTheDocument();
    expect(screen.queryByText(/Tomas Reyl/)).not.toBeInTheDocument();
  });
});

describe('a bench session the hub no longer accepts', () => {
  it('goes back to sign-in when the hub says the session has ended', async () => {
    stubHub({
      'GET /me': () => [
        401,
        { message: 'Your sign-in has been switched off: ask an admin', errors: [] },
      ],
    });
    setSession(signInAnswer({ name: 'Priya Sandell', role: 'operator' }, { id: 'bench-1' }));
    renderRoutes(routes, '/bench');
    expect(await screen.findByRole('heading', { name: 'Scan your badge' })).toBeInTheDocument();
    expect(screen.queryByText(/Priya Sandell/)).not.toBeInTheDocument();
  });
});
