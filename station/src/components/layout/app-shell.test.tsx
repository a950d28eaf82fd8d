import { screen } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { routes } from '../../app/router';
import { renderRoutes } from '../../testing/render';

function answerHealth(body: unknown, status = 200) {
  vi.stubGlobal(
    'fetch',
    vi.fn(
      async () =>
        new Response(JSON.stringify(body), {
          status,
          headers: { 'Content-Type': 'application/json' },
        }),
    ),
  );
}

// What a hub with a working database answers.
const HEALTHY = { status: 'ok', version: '0.1.0', uptimeS: 3, db: { ok: true, driver: 'pglite' } };

afterEach(() => {
  vi.unstubAllGlobals();
});

describe('app shell', () => {
  it('opens on the bench sign-in, shows both areas and says the hub is connected', async () => {
    answerHealth(HEALTHY);
    renderRoutes(routes, '/');
    expect(await screen.findByRole('heading', { name: 'Scan your badge' })).toBeInTheDocument();
    const nav = screen.getByRole('navigation', { name: 'Areas' });
    expect(nav).toHaveTextContent('Bench');
    expect(nav).toHaveTextContent('Review');
    expect(await screen.findByText('Hub: connected')).toBeInTheDocument();
  });

  it('sends a signed-out visitor of the review area to the desk sign-in', async () => {
    answerHealth(HEALTHY);
    renderRoutes(routes, '/bench');
    await userEvent.click(screen.getByRole('link', { name: 'Review' }));
    expect(await screen.findByRole('heading', { name: 'Sign in' })).toBeInTheDocument();
  });

  it('warns when the database does not answer', async () => {
    answerHealth({
      status: 'degraded',
      version: '0.1.0',
      uptimeS: 3,
      db: { ok: false, driver: 'pglite', detail: 'closed' },
    });
    renderRoutes(routes, '/bench');
    expect(await screen.findByText('Hub: database problem')).toBeInTheDocument();
  });

  it('says so when the hub cannot be reached', async () => {
    vi.stubGlobal(
      'fetch',
      vi.fn(async () => Promise.reject(new TypeError('Failed to fetch'))),
    );
    renderRoutes(routes, '/bench');
    expect(await screen.findByText('Hub: not reachable')).toBeInTheDocument();
  });

  it('switches to the dark theme from the header and remembers it on this screen', async () => {
    answerHealth(HEALTHY);
    const first = renderRoutes(routes, '/bench');
    const toggle = await screen.findByRole('button', { name: 'Dark theme' });
    expect(toggle).toHaveAttribute('aria-pressed', 'false');
    await userEvent.click(toggle);
    expect(toggle).toHaveAttribute('aria-pressed', 'true');
    expect(document.documentElement).toHaveAttribute('data-theme', 'dark');

    // A reload of the bench screen comes back dark.
    first.unmount();
    delete document.documentElement.dataset.theme;
    renderRoutes(routes, '/bench');
    expect(await screen.findByRole('button', { name: 'Dark theme' })).toHaveAttribute(
      'aria-pressed',
      'true',
    );
    expect(document.documentElement).toHaveAttribute('data-theme', 'dark');

    await userEvent.click(screen.getByRole('button', { name: 'Dark theme' }));
    expect(document.documentElement).toHaveAttribute('data-theme', 'light');
  });

  it('follows a device set to dark until someone chooses', async () => {
    answerHealth(HEALTHY);
    vi.stubGlobal('matchMedia', (query: string) => ({
      matches: query === '(prefers-color-scheme: dark)',
      addEventListener: () => {},
      removeEventListener: () => {},
    }));
    renderRoutes(routes, '/bench');
    const toggle = await screen.findByRole('button', { name: 'Dark theme' });
    expect(toggle).toHaveAttribute('aria-pressed', 'true');
    // No choice stored: the page leaves the theme to the device (index.css follows it).
    expect(document.documentElement).not.toHaveAttribute('data-theme');
    expect(localStorage.getItem('tareline.theme')).toBeNull();

    await userEvent.click(toggle);
    expect(toggle).toHaveAttribute('aria-pressed', 'false');
    expect(document.documentElement).toHaveAttribute('data-theme', 'light');
    expect(localStorage.getItem('tareline.theme')).toBe('light');
  });
});
