import type { PlanResponse } from '@tareline/protocol';
import { render, screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { routes } from '../../../app/router';
import { renderRoutes } from '../../../testing/render';
import { VolumeEstimator } from './volume-estimator';

const box = (name: string) => screen.getByRole('textbox', { name });

// No pause between keys: each key still goes through the form as a person's would.
const user = userEvent.setup({ delay: null });

async function typeInto(name: string, text: string) {
  const input = box(name);
  await user.clear(input);
  await user.type(input, text);
}

async function fillEpoxyBox() {
  await typeInto('Length', '6');
  await typeInto('Width', '5');
  await typeInto('Height', '1.5');
  await typeInto('Part A', '100');
  await typeInto('Part B', '14');
  await typeInto('Specific gravity', '1.2');
}

function row(step: RegExp | string) {
  return screen.getByRole('row', { name: step });
}

afterEach(() => {
  vi.unstubAllGlobals();
});

describe('volume estimator', { timeout: 20_000 }, () => {
  it('shows every step, metric and imperial, as the sizes are typed', async () => {
    render(<VolumeEstimator />);
    expect(screen.getByText('Enter the length')).toBeInTheDocument();
    // No model was chosen: its volume is not on the list of what is missing.
    expect(screen.queryByText('Enter the model volume')).not.toBeInTheDocument();
    await fillEpoxyBox();
    await typeInto('Overage', '10');
    await typeInto('Cup loss', '12');

    // Common practice, no published source: a 6 × 5 × 1.5 in box holds 45 in³
    // (737.4 cm³ by the 1959 inch).
    expect(row(/^Cavity/)).toHaveTextContent('737.4 cm³');
    expect(row(/^Cavity/)).toHaveTextContent('45.0 in³');
    expect(row(/overage/)).toHaveTextContent('+ 4.50 in³');
    expect(row(/^Volume to fill/)).toHaveTextContent('49.5 in³');
    // 811.16 cm³ × SG 1.2 = 973.4 g; + 12 g cup loss = 985.4 g = 2.172 lb (1959 pound).
    expect(row(/^Mass at SG 1.200/)).toHaveTextContent('973.4 g');
    expect(row(/^Plus cup loss/)).toHaveTextContent('+ 12.0 g');
    expect(row(/^Total to mix/)).toHaveTextContent('985.4 g');
    expect(row(/^Total to mix/)).toHaveTextContent('2.172 lb');
    // 100:14 by weight: 985.39 × 100 / 114 and × 14 / 114.
    expect(row(/^Part A/)).toHaveTextContent('864.4 g');
    expect(row(/^Part B/)).toHaveTextContent('121.0 g');
    expect(row(/^Part B/)).toHaveTextContent('4.27 oz');
    expect(screen.queryByText('The plan needs')).not.toBeInTheDocument();
  });

  it('puts a clear message on each bad field', async () => {
    render(<VolumeEstimator />);
    await typeInto('Width', '0');
    expect(box('Width')).toHaveAccessibleDescription('The width must be more than zero');
    expect(box('Width')).toHaveAttribute('aria-invalid', 'true');
    await typeInto('Length', 'six');
    expect(box('Length')).toHaveAccessibleDescription('The length must be a number');
    await typeInto('Length', '6');
    expect(box('Length')).not.toHaveAccessibleDescription('The length must be a number');
    expect(box('Length')).not.toHaveAttribute('aria-invalid');
  });

  it('refuses a model larger than the cavity, and water outside the table', async () => {
    render(<VolumeEstimator />);
    await fillEpoxyBox();
    await user.click(screen.getByRole('checkbox', { name: 'Subtract a model in the cavity' }));
    await typeInto('Model volume', '50');
    const message =
      'The model takes up as much room as the cavity or more: check both measurements';
    expect((await screen.findAllByText(message)).length).toBeGreaterThan(0);
    expect(screen.queryByRole('row', { name: /^Part A/ })).not.toBeInTheDocument();

    await typeInto('Model volume', '5');
    expect(row(/^Minus the model/)).toHaveTextContent('− 5.00 in³');
    expect(row(/^Net volume/)).toHaveTextContent('40.0 in³');

    await user.selectOptions(screen.getByRole('combobox', { name: 'Shape' }), 'water');
    await typeInto('Water mass', '850');
    await typeInto('Water temperature', '55');
    expect(box('Water temperature')).toHaveAccessibleDescription(
      /^The water temperature must be between 0 and 40 °C/,
    );
    await typeInto('Water temperature', '22');
    // 850 g / 0.997769 g/cm³ (Kell's equation, ITS-90 form, at 22 °C) = 851.9 cm³.
    expect(row(/^Cavity/)).toHaveTextContent('851.9 cm³');
  });

  it('sizes a cylinder by radius and a ratio by volume with each part SG', async () => {
    render(<VolumeEstimator />);
    await user.selectOptions(screen.getByRole('combobox', { name: 'Shape' }), 'cylinder');
    await user.selectOptions(screen.getByRole('combobox', { name: 'Measured across' }), 'radius');
    await typeInto('Radius', '2');
    await typeInto('Height', '1.5');
    await user.selectOptions(screen.getByRole('combobox', { name: 'Mix ratio' }), 'volume');
    await typeInto('Part A', '1');
    await typeInto('Part B', '1');
    await typeInto('SG of part A', '1.1');
    await typeInto('SG of part B', '0.98');
    // Common practice, no published source: radius 2 in × 1.5 in holds about 18.8 in³ (18.85).
    expect(row(/^Cavity/)).toHaveTextContent('18.8 in³');
    // mass = volume × SG; SG of a 1:1-by-volume mix is the mean, 1.04.
    expect(row(/^Mass at SG 1.040/)).toBeInTheDocument();
  });

  it('warns when the scale is too coarse for the smallest part', async () => {
    render(<VolumeEstimator />);
    await fillEpoxyBox();
    await user.click(screen.getByRole('checkbox', { name: 'Check against my scale' }));
    await typeInto('Readability', '2');
    await typeInto('Capacity', '500');
    const warnings = screen.getByRole('list', { name: 'Warnings' });
    // USP <41> applied to ±1 %: 82 d = 164 g > part B (108.7 g).
    expect(
      within(warnings).getByText(/^Part B \(108\.7 g\) is below the smallest mass/),
    ).toBeInTheDocument();
    expect(
      within(warnings).getByText(/more than the scale's capacity \(500\.0 g\)/),
    ).toBeInTheDocument();
  });

  it('takes a material from the bench flow and reports each plan', async () => {
    const onPlan = vi.fn<(plan: PlanResponse | undefined) => void>();
    render(
      <VolumeEstimator
        material={{ ratio: { basis: 'weight', parts: [100, 50] }, specificGravity: 1 }}
        onPlan={onPlan}
      />,
    );
    expect(screen.queryByRole('textbox', { name: 'Part A' })).not.toBeInTheDocument();
    expect(onPlan).toHaveBeenLastCalledWith(undefined);
    await user.selectOptions(screen.getByRole('combobox', { name: 'Shape' }), 'volume');
    await user.selectOptions(screen.getByRole('combobox', { name: 'Volume unit' }), 'cm3');
    await typeInto('Volume', '300');
    const plan = onPlan.mock.lastCall?.[0];
    // 300 cm³ × SG 1 = 300 g, split 100:50.
    expect(plan?.totalMassG).toBeCloseTo(300, 9);
    expect(plan?.parts.map((p) => p.massG)).toEqual([200, 100]);
    expect(row(/^Part B/)).toHaveTextContent('100.0 g');
  });

  it('is reachable from the header without signing in', async () => {
    vi.stubGlobal(
      'fetch',
      vi.fn(async () => Promise.reject(new TypeError('Failed to fetch'))),
    );
    renderRoutes(routes, '/bench');
    await user.click(screen.getByRole('link', { name: 'Pour planner' }));
    expect(await screen.findByRole('heading', { name: 'Volume estimator' })).toBeInTheDocument();
    expect(screen.getByRole('form', { name: 'Volume estimator' })).toBeInTheDocument();
  });
});
