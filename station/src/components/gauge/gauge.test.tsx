import type { ReadingEvent, ScaleStatusEvent } from '@tareline/protocol';
import { render, screen } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { Gauge } from './gauge';

const online: ScaleStatusEvent = { benchId: 'bench-1', state: 'online', detail: 'simulated scale' };
const reading = (netG: number, extra: Partial<ReadingEvent> = {}): ReadingEvent => ({
  benchId: 'bench-1',
  seq: 1,
  t: 0,
  grossG: netG + 40,
  netG,
  stable: true,
  ...extra,
});
// A 100:14 part B after 100 g of part A with a ±1 % band (common practice, no published source).
const partB = { targetG: 14, band: { lowG: 13.86, highG: 14.14 }, slowDownFromG: 12.6 };

describe('Gauge', () => {
  it('shows the net weight with the decimals of the scale and the scale state', () => {
    render(<Gauge reading={reading(114.1)} status={online} readabilityG={0.01} />);
    expect(screen.getByTestId('net-weight')).toHaveTextContent('114.10');
    expect(screen.getByRole('status')).toHaveTextContent('Scale: online');
    expect(screen.getByText(/gross 154.10 g/)).toBeInTheDocument();
  });

  it('shows the verdict as a word with its hint while online', () => {
    render(
      <Gauge reading={reading(14.02)} status={online} verdict="GO" label="Part B" {...partB} />,
    );
    expect(screen.getByRole('region', { name: 'Gauge: Part B' })).toBeInTheDocument();
    expect(screen.getByText('GO')).toBeInTheDocument();
    expect(screen.getByText('in the band')).toBeInTheDocument();
  });

  it('withholds the verdict while the scale is not online, and says why', () => {
    const stale: ScaleStatusEvent = {
      ...online,
      state: 'stale',
      detail: 'no line from the scale for 2 s',
    };
    render(<Gauge reading={reading(14.02)} status={stale} verdict="GO" {...partB} />);
    expect(screen.queryByText('GO')).not.toBeInTheDocument();
    expect(screen.getByText('No verdict while the scale is not sending')).toBeInTheDocument();
    expect(screen.getByText('no line from the scale for 2 s')).toBeInTheDocument();
  });

  it('asks to slow down as the pour nears the band, and not before', () => {
    const { rerender } = render(
      <Gauge reading={reading(10)} status={online} verdict="UNDER" {...partB} />,
    );
    expect(screen.queryByText(/Slow down/)).not.toBeInTheDocument();
    expect(screen.getByText('UNDER')).toBeInTheDocument();
    rerender(<Gauge reading={reading(13.1)} status={online} verdict="UNDER" {...partB} />);
    expect(screen.getByText('Slow down: near the target')).toBeInTheDocument();
  });

  it('magnifies around the target inside the slow-down zone and says what is still to pour', () => {
    const { rerender } = render(
      <Gauge reading={reading(10)} status={online} verdict="UNDER" {...partB} />,
    );
    expect(screen.getByTestId('gauge-track')).toHaveAttribute('data-view', 'whole');
    rerender(<Gauge reading={reading(13.76)} status={online} verdict="UNDER" {...partB} />);
    expect(screen.getByTestId('gauge-track')).toHaveAttribute('data-view', 'fine');
    // 14 − 13.76 = 0.24 g to pour.
    expect(screen.getByTestId('to-go')).toHaveTextContent('0.24 g to go');
    // The band takes 30 % of the magnified track (see track.ts).
    const band = document.querySelector<HTMLElement>('[data-zone="band"]')!;
    expect(parseFloat(band.style.width)).toBeGreaterThanOrEqual(25);
    expect(screen.getByText('Close-up around the target')).toBeInTheDocument();
  });

  it('says overload instead of a number', () => {
    render(<Gauge reading={reading(0, { outOfRange: 'overload' })} status={online} />);
    expect(screen.getByTestId('net-weight')).toHaveTextContent('OVERLOAD');
  });

  it('shows a dash before the first reading', () => {
    render(<Gauge status={{ ...online, state: 'connecting', detail: 'Connecting to the hub…' }} />);
    expect(screen.getByTestId('net-weight')).toHaveTextContent('—');
    expect(screen.getByRole('status')).toHaveTextContent('Scale: connecting');
  });
});
