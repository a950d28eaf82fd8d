import type { Person } from '@tareline/protocol';
import { screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { beforeEach, describe, expect, it } from 'vitest';
import { routes } from '../../../app/router';
import { setSession } from '../../../lib/auth';
import { signInAnswer, stubHub, type FakeRequest } from '../../../testing/fake-hub';
import { renderRoutes } from '../../../testing/render';

function person(p: Partial<Person> & { name: string }): Person {
  return {
    id: `id-${p.name.replace(/\s/g, '-')}`,
    role: 'operator',
    active: true,
    email: null,
    hasBadge: true,
    hasPin: false,
    hasPassword: false,
    createdAt: '2026-01-01T00:00:00.000Z',
    ...p,
  };
}

describe('people page', () => {
  let people: Person[];
  let requests: FakeRequest[];

  beforeEach(() => {
    people = [
      person({ name: 'Joss Whitcombe' }),
      person({ name: 'Oda Fenwick', role: 'admin', email: 'oda@x.example', hasPassword: true }),
    ];
    const change = (id: string, fields: Partial<Person>): [number, unknown] => {
      const p = people.find((x) => x.id === id)!;
      Object.assign(p, fields);
      return [200, p];
    };
    requests = stubHub({
      'GET /people': () => [200, people],
      'POST /people': ({ body }) => {
        const b = body as { name: string; role: Person['role']; badge?: string; pin?: string };
        if (b.badge === 'HR-1001') {
          return [
            409,
            {
              message: 'This badge belongs to someone else: take it off them first',
              errors: [{ path: 'badge', message: 'This badge belongs to someone else' }],
            },
          ];
        }
        const added = person({ name: b.name, role: b.role, hasPin: !!b.pin });
        people.push(added);
        return [201, added];
      },
      [`PATCH /people/id-Joss-Whitcombe`]: ({ body }) =>
        change('id-Joss-Whitcombe', body as Partial<Person>),
      [`PUT /people/id-Joss-Whitcombe/badge`]: () =>
        change('id-Joss-Whitcombe', { hasBadge: true }),
      [`PUT /people/id-Joss-Whitcombe/pin`]: ({ body }) =>
        change('id-Joss-Whitcombe', { hasPin: (body as { pin: string | null }).pin !== null }),
    });
    setSession(signInAnswer({ name: 'Oda Fenwick', role: 'admin' }));
  });

  it('lists people in a table with role, badge, PIN and status', async () => {
    renderRoutes(routes, '/review/people');
    const table = await screen.findByRole('table');
    const rows = within(table).getAllByRole('row');
    expect(rows).toHaveLength(3);
    expect(rows[1]).toHaveTextContent('Joss Whitcombe');
    expect(rows[1]).toHaveTextContent('operator');
    expect(rows[2]).toHaveTextContent('oda@x.example');
  });

  it('adds an operator, with clear messages on bad fields first', async () => {
    renderRoutes(routes, '/review/people');
    await userEvent.click(await screen.findByRole('button', { name: 'Add person' }));
    const form = screen.getByRole('form', { name: 'Add person' });
    await userEvent.type(within(form).getByLabelText(/^PIN/), '12');
    await userEvent.selectOptions(within(form).getByLabelText('Role'), 'lead');
    await userEvent.click(within(form).getByRole('button', { name: 'Save person' }));
    expect(await within(form).findByText('Enter a name')).toBeInTheDocument();
    expect(within(form).getByText('A PIN is 4 to 8 digits')).toBeInTheDocument();
    expect(within(form).getByText('A lead or admin needs an e-mail')).toBeInTheDocument();
    expect(requests.filter((r) => r.method === 'POST')).toEqual([]);

    await userEvent.selectOptions(within(form).getByLabelText('Role'), 'operator');
    await userEvent.type(within(form).getByLabelText('Name'), 'Wren Castellan');
    await userEvent.clear(within(form).getByLabelText(/^PIN/));
    await userEvent.type(within(form).getByLabelText(/^PIN/), '8080');
    await userEvent.type(within(form).getByLabelText('Badge code'), 'HR-1010');
    await userEvent.click(within(form).getByRole('button', { name: 'Save person' }));
    expect(await screen.findByRole('cell', { name: 'Wren Castellan' })).toBeInTheDocument();
    expect(requests.find((r) => r.method === 'POST')?.body).toMatchObject({
      name: 'Wren Castellan',
      role: 'operator',
      badge: 'HR-1010',
      pin: '8080',
    });
  });

  it("puts the hub's refusal on the field it names", async () => {
    renderRoutes(routes, '/review/people');
    await userEvent.click(await screen.findByRole('button', { name: 'Add person' }));
    const form = screen.getByRole('form', { name: 'Add person' });
    await userEvent.type(within(form).getByLabelText('Name'), 'Badge Borrower');
    await userEvent.type(within(form).getByLabelText('Badge code'), 'HR-1001');
    await userEvent.click(within(form).getByRole('button', { name: 'Save person' }));
    expect(await within(form).findByText('This badge belongs to someone else')).toBeInTheDocument();
  });

  it('deactivates a person and sets their role', async () => {
    renderRoutes(routes, '/review/people');
    await userEvent.click(await screen.findByRole('button', { name: 'Manage Joss Whitcombe' }));
    const panel = screen.getByRole('region', { name: 'Manage Joss Whitcombe' });
    await userEvent.click(within(panel).getByRole('button', { name: 'Deactivate' }));
    expect(await within(panel).findByRole('status')).toHaveTextContent(
      'Joss Whitcombe is deactivated',
    );
    expect(await screen.findByRole('cell', { name: 'deactivated' })).toBeInTheDocument();

    await userEvent.selectOptions(within(panel).getByLabelText('Role'), 'lead');
    await userEvent.click(within(panel).getByRole('button', { name: 'Save changes' }));
    expect(requests.filter((r) => r.method === 'PATCH').map((r) => r.body)).toEqual([
      { active: false },
      { name: 'Joss Whitcombe', email: null, role: 'lead' },
    ]);
  });

  it('assigns a badge by scanning it', async () => {
    renderRoutes(routes, '/review/people');
    await userEvent.click(await screen.findByRole('button', { name: 'Manage Joss Whitcombe' }));
    const panel = screen.getByRole('region', { name: 'Manage Joss Whitcombe' });
    await userEvent.click(within(panel).getByRole('button', { name: 'Replace badge' }));
    expect(within(panel).getByText('Scan the badge now, or type its code:')).toBeInTheDocument();
    (document.activeElement as HTMLElement | null)?.blur();
    await userEvent.keyboard('HR-2003{Enter}');
    expect(await within(panel).findByText('Badge assigned to Joss Whitcombe')).toBeInTheDocument();
    expect(requests.find((r) => r.path.endsWith('/badge'))?.body).toEqual({ badge: 'HR-2003' });
  });

  it('resets a PIN, refusing one that is not 4 to 8 digits', async () => {
    renderRoutes(routes, '/review/people');
    await userEvent.click(await screen.findByRole('button', { name: 'Manage Joss Whitcombe' }));
    const panel = screen.getByRole('region', { name: 'Manage Joss Whitcombe' });
    await userEvent.type(within(panel).getByLabelText('New PIN'), '12ab');
    await userEvent.click(within(panel).getByRole('button', { name: 'Set PIN' }));
    expect(await within(panel).findByText('A PIN is 4 to 8 digits')).toBeInTheDocument();
    await userEvent.clear(within(panel).getByLabelText('New PIN'));
    await userEvent.type(within(panel).getByLabelText('New PIN'), '4455');
    await userEvent.click(within(panel).getByRole('button', { name: 'Set PIN' }));
    expect(await within(panel).findByText('PIN set for Joss Whitcombe')).toBeInTheDocument();
    expect(requests.find((r) => r.path.endsWith('/pin'))?.body).toEqual({ pin: '4455' });
  });
});
