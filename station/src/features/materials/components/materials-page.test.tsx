import type { Lot, Material } from '@tareline/protocol';
import { screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { beforeEach, describe, expect, it } from 'vitest';
import { routes } from '../../../app/router';
import { setSession } from '../../../lib/auth';
import { signInAnswer, stubHub, type FakeRequest } from '../../../testing/fake-hub';
import { sc14 } from '../../../testing/fixtures';
import { renderRoutes } from '../../../testing/render';

const user = userEvent.setup({ delay: null });

describe('materials page', () => {
  let materials: Material[];
  let requests: FakeRequest[];
  const lots: Lot[] = [
    {
      id: 'lot-h',
      materialId: sc14.id,
      part: 1,
      code: 'SC14H-2511',
      receivedG: 500,
      onHandG: 120,
      warnings: [
        {
          code: 'LOT_LOW_STOCK',
          message: 'Lot SC14H-2511 is low: 120 g left (reorder below 150 g)',
        },
      ],
    },
  ];

  beforeEach(() => {
    materials = [{ ...sc14, costPerKg: [38, 52], lowStockG: [1000, 150] }];
    requests = stubHub({
      'GET /materials': () => [200, materials.filter((m) => m.active)],
      'GET /materials?includeRetired=true': () => [200, materials],
      'GET /lots': () => [200, lots],
      [`PATCH /materials/${sc14.id}`]: ({ body }) => {
        Object.assign(materials[0]!, body);
        return [200, materials[0]];
      },
      'POST /materials/import': () => [
        400,
        {
          message: 'Nothing was imported: correct the rows named and import the file again',
          errors: [
            { path: 'row 3.name', message: 'Row 3: Enter a name' },
            { path: 'row 5.costPerKg', message: 'Row 5: Give one value for each of the 2 parts' },
          ],
        },
      ],
    });
    setSession(signInAnswer({ name: 'Ilse Varga', role: 'lead' }));
  });

  it('shows stock per part with the low-stock warning, and retires a material on request', async () => {
    renderRoutes(routes, '/materials');
    const row = await screen.findByRole('row', { name: /SC-14/ });
    expect(row).toHaveTextContent('Part B (Hardener): 120 g');
    expect(row).toHaveTextContent('Lot SC14H-2511 is low: 120 g left (reorder below 150 g)');
    await user.click(within(row).getByRole('button', { name: /^Retire/ }));
    expect(
      await screen.findByText(/is retired: hidden at the bench, its batches kept/),
    ).toBeInTheDocument();
    expect(requests.find((r) => r.method === 'PATCH')?.body).toEqual({ active: false });
    await user.click(screen.getByRole('checkbox', { name: 'Show retired materials' }));
    expect(await screen.findByRole('cell', { name: 'retired' })).toBeInTheDocument();
  });

  it('lists each bad row of a refused import', async () => {
    renderRoutes(routes, '/materials');
    await screen.findByRole('row', { name: /SC-14/ });
    const file = new File(['name\r\n'], 'library.csv', { type: 'text/csv' });
    await user.upload(screen.getByLabelText('Library file to import'), file);
    const alert = await screen.findByRole('alert');
    expect(alert).toHaveTextContent(/^Nothing was imported/);
    expect(
      within(alert)
        .getAllByRole('listitem')
        .map((li) => li.textContent),
    ).toEqual(['Row 3: Enter a name', 'Row 5: Give one value for each of the 2 parts']);
    expect(requests.find((r) => r.path === '/materials/import')?.body).toEqual({ csv: 'name\r\n' });
  });

  it('edits a material: the form starts from its values and sends cleared fields as null', async () => {
    renderRoutes(routes, '/materials');
    const row = await screen.findByRole('row', { name: /SC-14/ });
    await user.click(within(row).getByRole('button', { name: /^Edit/ }));
    const form = screen.getByRole('form', { name: /^Edit/ });
    expect(within(form).getByLabelText('Cost per kg, part B')).toHaveValue('52');
    await user.clear(within(form).getByLabelText('Warn below, part A'));
    await user.clear(within(form).getByLabelText('Warn below, part B'));
    await user.clear(within(form).getByLabelText('Cost per kg, part A'));
    await user.type(within(form).getByLabelText('Cost per kg, part A'), '40,5');
    await user.click(within(form).getByRole('button', { name: 'Save material' }));
    await screen.findByRole('row', { name: /SC-14/ });
    expect(requests.find((r) => r.method === 'PATCH')?.body).toMatchObject({
      costPerKg: [40.5, 52],
      lowStockG: null,
      ratio: sc14.ratio,
    });
  });
});
