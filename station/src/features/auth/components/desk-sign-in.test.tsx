import { screen } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { routes } from '../../../app/router';
import { setSession } from '../../../lib/auth';
import { signInAnswer, stubHub } from '../../../testing/fake-hub';
import { renderRoutes } from '../../../testing/render';

describe('desk sign-in and role-guarded pages', () => {
  it('sends a signed-out visitor to sign in and back to the page they asked for', async () => {
    const requests = stubHub({
      'POST /auth/login': () => [200, signInAnswer({ name: 'Ilse Varga', role: 'lead' })],
    });
    const { router } = renderRoutes(routes, '/review');
    expect(await screen.findByRole('heading', { name: 'Sign in' })).toBeInTheDocument();
    await userEvent.type(screen.getByLabelText('E-mail'), 'ilse.varga@hollin-ridge.example');
    await userEvent.type(screen.getByLabelText('Password'), 'ridge-lead-demo');
    await userEvent.click(screen.getByRole('button', { name: 'Sign in' }));
    expect(await screen.findByRole('heading', { name: 'Review' })).toBeInTheDocument();
    expect(router.state.location.pathname).toBe('/review');
    expect(requests[0]?.body).toEqual({
      email: 'ilse.varga@hollin-ridge.example',
      password: 'ridge-lead-demo',
    });
    expect(screen.getByLabelText('Signed in')).toHaveTextContent('Ilse Varga (lead)');
  });

  it('names the bad fields before asking the hub', async () => {
    const requests = stubHub({});
    renderRoutes(routes, '/login');
    await userEvent.type(await screen.findByLabelText('E-mail'), 'not-an-address');
    await userEvent.click(screen.getByRole('button', { name: 'Sign in' }));
    expect(await screen.findByText('Enter a valid e-mail address')).toBeInTheDocument();
    expect(screen.getByText('Enter your password')).toBeInTheDocument();
    expect(requests).toEqual([]);
  });

  it("shows the hub's refusal", async () => {
    stubHub({
      'POST /auth/login': () => [401, { message: 'E-mail or password not recognised', errors: [] }],
    });
    renderRoutes(routes, '/login');
    await userEvent.type(await screen.findByLabelText('E-mail'), 'nobody@example.test');
    await userEvent.type(screen.getByLabelText('Password'), 'whatever it is');
    await userEvent.click(screen.getByRole('button', { name: 'Sign in' }));
    expect(await screen.findByRole('alert')).toHaveTextContent('E-mail or password not recognised');
  });

  it('tells an operator the review pages are not for their role', async () => {
    stubHub({});
    setSession(signInAnswer({ name: 'Tomas Reyl', role: 'operator' }, { id: 'bench-1' }));
    renderRoutes(routes, '/review');
    expect(await screen.findByRole('heading', { name: 'Not for your role' })).toBeInTheDocument();
    expect(screen.queryByRole('heading', { name: 'Review' })).not.toBeInTheDocument();
  });

  it('keeps the people page to admins', async () => {
    stubHub({});
    setSession(signInAnswer({ name: 'Ilse Varga', role: 'lead' }));
    renderRoutes(routes, '/review/people');
    expect(await screen.findByRole('heading', { name: 'Not for your role' })).toBeInTheDocument();
  });

  it('signs a desk session out from the header', async () => {
    stubHub({ 'POST /auth/logout': () => [204] });
    setSession(signInAnswer({ name: 'Ilse Varga', role: 'lead' }));
    renderRoutes(routes, '/review');
    await userEvent.click(await screen.findByRole('button', { name: 'Sign out' }));
    expect(await screen.findByRole('heading', { name: 'Sign in' })).toBeInTheDocument();
    expect(screen.queryByText(/Ilse Varga/)).not.toBeInTheDocument();
  });
});
