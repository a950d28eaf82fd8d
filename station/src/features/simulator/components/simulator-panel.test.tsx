import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { stubHub } from '../../../testing/fake-hub';
import { renderRoutes } from '../../../testing/render';
import { SimulatorPanel } from './simulator-panel';

const at = (path: string) =>
  renderRoutes([{ path: '*', element: <SimulatorPanel benchId="bench-1" /> }], path);

describe('the simulated scale panel', () => {
  it('sends a pour to the hub and waits for it to finish', async () => {
    let finish: (v: [number, unknown]) => void = () => undefined;
    const requests = stubHub({
      'POST /benches/bench-1/simulator': () => new Promise((r) => (finish = r)),
    });
    at('/');
    await userEvent.click(await screen.findByRole('button', { name: 'Pour 1 g' }));
    expect(await screen.findByText('The simulator is busy…')).toBeInTheDocument();
    expect(screen.getByRole('button', { name: 'Pour 10 g' })).toBeDisabled();
    expect(requests[0]?.body).toEqual([{ do: 'pour', grams: 1, rateGPerS: 1 }, { do: 'settle' }]);
    finish([200, { benchId: 'bench-1', steps: 2 }]);
    await waitFor(() => expect(screen.getByRole('button', { name: 'Pour 10 g' })).toBeEnabled());
    expect(screen.queryByText('The simulator is busy…')).not.toBeInTheDocument();
  });

  it('names a bad amount before asking the hub, and shows what the hub refused', async () => {
    const requests = stubHub({
      'POST /benches/bench-1/simulator': () => [
        409,
        { message: 'bench-1 reads a real scale, not the simulator', errors: [] },
      ],
    });
    at('/');
    await userEvent.type(await screen.findByLabelText(/Pour/), '-3');
    await userEvent.click(screen.getByRole('button', { name: 'Pour it' }));
    expect(await screen.findByRole('alert')).toHaveTextContent('Pour more than 0 g');
    expect(requests).toEqual([]);

    await userEvent.click(screen.getByRole('button', { name: 'Lift the cup' }));
    expect(
      await screen.findByText('bench-1 reads a real scale, not the simulator'),
    ).toBeInTheDocument();
    expect(requests[0]?.body).toEqual([{ do: 'lift-cup' }]);
  });
});
