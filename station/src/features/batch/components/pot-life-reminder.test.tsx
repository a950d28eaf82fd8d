import { screen } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { routes } from '../../../app/router';
import { stubHub } from '../../../testing/fake-hub';
import { savedBatch } from '../../../testing/fixtures';
import { renderRoutes } from '../../../testing/render';
import { rememberLastPoured } from '../utils/last-poured';

afterEach(() => {
  vi.useRealTimers();
  localStorage.clear();
});

describe('the pot life of the last batch on a signed-out bench', () => {
  it('stays on the sign-in screen while it runs, without the name of who mixed it', async () => {
    vi.useFakeTimers({ toFake: ['Date'] });
    vi.setSystemTime(new Date('2026-12-02T08:07:00.000Z'));
    stubHub({});
    // Saved at 08:02 with a 25 min pot life: 20 min left at 08:07.
    rememberLastPoured('bench-1', savedBatch({ savedAt: '2026-12-02T08:02:00.000Z' }));
    renderRoutes(routes, '/bench');
    const reminder = await screen.findByRole('complementary', { name: 'Pot life running' });
    expect(reminder).toHaveTextContent(
      'Batch 42, Grey surface-coat epoxy SC-14: pot life 20:00 left',
    );
    expect(reminder).not.toHaveTextContent('Wren Ashby');
    expect(screen.getByRole('heading', { name: 'Scan your badge' })).toBeInTheDocument();
  });

  it('is gone once the pot life is over, and never shown for another bench', async () => {
    vi.useFakeTimers({ toFake: ['Date'] });
    vi.setSystemTime(new Date('2026-12-02T08:30:00.000Z'));
    stubHub({});
    rememberLastPoured('bench-1', savedBatch({ savedAt: '2026-12-02T08:02:00.000Z' }));
    rememberLastPoured('bench-2', savedBatch({ id: 43, savedAt: '2026-12-02T08:20:00.000Z' }));
    renderRoutes(routes, '/bench?bench=bench-1');
    await screen.findByRole('heading', { name: 'Scan your badge' });
    expect(screen.queryByRole('complementary', { name: 'Pot life running' })).toBeNull();
  });
});
