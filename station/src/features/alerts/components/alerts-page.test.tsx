import type { AlertSubscription, CaughtMail, OutboxMessage } from '@tareline/protocol';
import { screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { beforeEach, describe, expect, it } from 'vitest';
import { routes } from '../../../app/router';
import { setSession } from '../../../lib/auth';
import { signInAnswer, stubHub, type FakeRequest } from '../../../testing/fake-hub';
import { renderRoutes } from '../../../testing/render';

const FAILED: OutboxMessage = {
  id: 2,
  event: 'batch.no-go',
  to: 'nobody@hollin-ridge.example',
  subject: 'Tareline: A batch saved NO-GO - batch #41, Bench 1, SC-14',
  status: 'failed',
  attempts: 1,
  lastError: '550 5.1.1 <nobody@hollin-ridge.example>: no such mailbox here',
  createdAt: '2026-12-02T06:00:00.000Z',
  nextAttemptAt: null,
  sentAt: null,
};

const CAUGHT: CaughtMail = {
  id: 1,
  receivedAt: '2026-12-02T06:00:01.000Z',
  from: 'tareline@localhost',
  to: ['ilse.varga@hollin-ridge.example'],
  subject: 'Tareline: A batch saved NO-GO - batch #41, Bench 1, SC-14',
  text: 'A batch saved NO-GO\n\nBatch: #41\nOpen the batch: http://localhost:3000/review/batches/41',
  raw: '',
};

describe('alerts page', () => {
  let requests: FakeRequest[];
  let mine: AlertSubscription;

  beforeEach(() => {
    mine = { personId: 'p-1', email: 'ilse.varga@hollin-ridge.example', events: ['batch.no-go'] };
    requests = stubHub({
      'GET /me/alerts': () => [200, mine],
      'PUT /me/alerts': ({ body }) => {
        mine = { ...mine, events: (body as { events: AlertSubscription['events'] }).events };
        return [200, mine];
      },
      'GET /outbox': () => [200, [FAILED]],
      'GET /mail-catcher': () => [200, [CAUGHT]],
    });
  });

  it('shows a lead their alerts, NO-GO ticked, and saves a new choice', async () => {
    setSession(signInAnswer({ name: 'Ilse Varga', role: 'lead' }));
    renderRoutes(routes, '/alerts');
    const form = await screen.findByRole('form', { name: 'My alerts' });
    expect(within(form).getByText('Mails go to ilse.varga@hollin-ridge.example.')).toBeVisible();
    expect(within(form).getByRole('checkbox', { name: 'A batch saved NO-GO' })).toBeChecked();
    await userEvent.click(within(form).getByRole('checkbox', { name: 'A batch abandoned' }));
    await userEvent.click(within(form).getByRole('button', { name: 'Save my alerts' }));
    expect(await within(form).findByRole('status')).toHaveTextContent('Your alerts are saved');
    expect(requests.find((r) => r.method === 'PUT')?.body).toEqual({
      events: ['batch.no-go', 'batch.abandoned'],
    });
    // The outbox and the catcher are for admins.
    expect(screen.queryByRole('table', { name: 'Outbox' })).toBeNull();
    expect(requests.some((r) => r.path.includes('/outbox'))).toBe(false);
  });

  it('shows an admin the outbox with the server’s words and the mail the catcher caught', async () => {
    setSession(signInAnswer({ name: 'Oda Fenwick', role: 'admin' }));
    renderRoutes(routes, '/alerts');
    const table = await screen.findByRole('table', { name: 'Outbox' });
    const row = within(table).getAllByRole('row')[1]!;
    expect(row).toHaveTextContent('failed');
    expect(row).toHaveTextContent('550 5.1.1 <nobody@hollin-ridge.example>: no such mailbox here');
    const mail = await screen.findByRole('article', { name: CAUGHT.subject });
    expect(mail).toHaveTextContent('To ilse.varga@hollin-ridge.example');
    expect(mail).toHaveTextContent('Open the batch: http://localhost:3000/review/batches/41');
  });
});
