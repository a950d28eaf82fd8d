import type { Batch } from '@tareline/protocol';
import { act, fireEvent, render, screen, within } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { savedBatch as savedBatchFixture, sc14 } from '../../../../testing/fixtures';
import { SavedBatch } from './saved-batch';

// Local wall-clock times, so the label's clock reads the same in any time zone the tests run in.
const SAVED_AT = new Date(2027, 2, 4, 14, 5, 0);

const material = sc14;
const savedBatch = (over: Partial<Batch> = {}): Batch =>
  savedBatchFixture({
    createdAt: SAVED_AT.toISOString(),
    savedAt: SAVED_AT.toISOString(),
    ...over,
  });

afterEach(() => {
  vi.useRealTimers();
});

describe('SavedBatch', () => {
  it('shows the batch number and a GO verdict by colour, shape and word', () => {
    render(<SavedBatch batch={savedBatch()} material={material} />);
    const banner = screen.getByRole('heading', { name: 'Batch 42 saved' }).closest('header')!;
    expect(banner).toHaveClass('bg-go');
    expect(within(banner).getByText('GO')).toBeInTheDocument();
    expect(banner.querySelector('svg')).not.toBeNull();
    expect(banner).toHaveTextContent('Weighed within the ±1 % band · ratio +0.71 %');
  });

  it('marks a NO-GO batch plainly and asks to keep the cup apart', () => {
    render(
      <SavedBatch
        batch={savedBatch({ verdict: 'NO-GO', ratioDeviationPct: 3.57 })}
        material={material}
      />,
    );
    const banner = screen.getByRole('heading', { name: 'Batch 42 saved' }).closest('header')!;
    expect(banner).toHaveClass('bg-over');
    expect(within(banner).getByText('NO-GO')).toBeInTheDocument();
    expect(banner).toHaveTextContent('Outside the ±1 % band · ratio +3.57 %');
    expect(banner).toHaveTextContent('Keep this cup apart');
    expect(within(screen.getByRole('article')).getByText('NO-GO')).toBeInTheDocument();
    // Its checklist keeps it apart and never says to pour it.
    const steps = screen.getByRole('region', { name: 'What to do with this cup' });
    expect(steps).toHaveTextContent('Keep the cup apart');
    expect(within(steps).queryByText(/^\d\. Pour/)).not.toBeInTheDocument();
    expect(screen.queryByRole('region', { name: 'Mixing steps' })).not.toBeInTheDocument();
  });

  it('names on the label everyone who handled the batch, the lead who allowed it, and a rescue', () => {
    render(
      <SavedBatch
        batch={savedBatch({
          handledBy: [
            { id: 'p-2', name: 'Ilse Varga', role: 'lead', at: SAVED_AT.toISOString() },
            { id: 'p-3', name: 'Tomas Erlund', role: 'operator', at: SAVED_AT.toISOString() },
          ],
          scaleOverride: {
            by: { id: 'p-2', name: 'Ilse Varga' },
            at: SAVED_AT.toISOString(),
            minNetG: 0.82,
            smallestBatchG: 3.86,
          },
          rescue: { addG: [3.5714, 0], totalAfterG: 118.07, fits: true },
          steps: { ...savedBatch().steps, rescueTaken: SAVED_AT.toISOString() },
        })}
        material={material}
      />,
    );
    const label = screen.getByRole('article');
    expect(label).toHaveTextContent('Ilse Varga (lead), Tomas Erlund (operator)');
    expect(label).toHaveTextContent('Ilse Varga: small for the scale');
    expect(label).toHaveTextContent('over-pour, then A +3.57 g');
  });

  it('counts the pot life down from the save and says when it is over', () => {
    vi.useFakeTimers({ now: SAVED_AT });
    render(<SavedBatch batch={savedBatch()} material={material} />);
    const timer = screen.getByRole('timer', { name: 'Pot life left' });
    expect(timer).toHaveTextContent('25:00');
    act(() => vi.advanceTimersByTime(1000));
    expect(timer).toHaveTextContent('24:59');
    expect(screen.getByText(/use by/)).toHaveTextContent('use by 2027-03-04 14:30');

    act(() => vi.advanceTimersByTime(24 * 60_000 + 58_000));
    expect(screen.getByRole('timer')).toHaveTextContent('00:01');
    act(() => vi.advanceTimersByTime(1000));
    expect(screen.queryByRole('timer')).not.toBeInTheDocument();
    expect(screen.getByRole('alert')).toHaveTextContent('Pot life over');
  });

  it('shows the pot life as over for a batch saved longer ago than its pot life', () => {
    vi.useFakeTimers({ now: SAVED_AT.getTime() + 26 * 60_000 });
    render(<SavedBatch batch={savedBatch()} material={material} />);
    expect(screen.getByRole('alert')).toHaveTextContent('Pot life over');
  });

  it('cautions about exotherm only when the batch is heavier than the pot life was rated for', () => {
    const { unmount } = render(<SavedBatch batch={savedBatch()} material={material} />);
    const caution = screen.getByRole('note', { name: 'Heavier than the pot life was rated for' });
    expect(caution).toHaveTextContent('This batch is 114.1 g; the pot life on file is for 100.0 g');
    expect(caution).toHaveTextContent('gels sooner (exotherm)');
    expect(caution).toHaveTextContent('data sheet comes first');
    unmount();

    // What was poured counts, not what was planned: 90 g planned, 114.1 g mixed.
    const { unmount: unmount2 } = render(
      <SavedBatch batch={savedBatch({ totalMassG: 90 })} material={material} />,
    );
    expect(
      screen.getByRole('note', { name: 'Heavier than the pot life was rated for' }),
    ).toHaveTextContent('This batch is 114.1 g');
    unmount2();

    render(
      <SavedBatch
        batch={savedBatch({
          totalMassG: 114,
          parts: [
            { label: 'Resin', targetG: 87.72, actualG: 87.7 },
            { label: 'Hardener', targetG: 12.28, actualG: 12.3 },
          ],
        })}
        material={material}
      />,
    );
    expect(screen.queryByRole('note')).not.toBeInTheDocument();
  });

  it('says so when no pot life is on file', () => {
    render(
      <SavedBatch
        batch={savedBatch({ potLifeMin: null, potLifeMassG: null })}
        material={{ ...material, potLifeMin: undefined, potLifeMassG: undefined }}
      />,
    );
    expect(screen.getByText(/No pot life on file for this material/)).toBeInTheDocument();
    expect(screen.queryByRole('timer')).not.toBeInTheDocument();
    const label = screen.getByRole('article', { name: 'Cup label for batch 42' });
    expect(label).toHaveTextContent('Use byno pot life on file');
  });

  it('prints a cup label with the parts, lots, operator, times, verdict and a QR of the batch', () => {
    const print = vi.spyOn(window, 'print').mockImplementation(() => {});
    render(<SavedBatch batch={savedBatch()} material={material} />);
    const label = screen.getByRole('article', { name: 'Cup label for batch 42' });
    expect(label).toHaveAttribute('data-print', 'label');
    const row = (term: string) => within(label).getByText(term).nextElementSibling;
    // One row a part: its letter, what was poured, its name and its lot.
    const part = (letter: string) =>
      within(label).getByRole('rowheader', { name: letter }).closest('tr');
    expect(part('A')).toHaveTextContent('100.00 g Resin');
    expect(part('A')).toHaveTextContent('lot HRP-R-2611');
    expect(part('B')).toHaveTextContent('14.10 g Hardener');
    expect(part('B')).toHaveTextContent('lot HRP-H-2702');
    expect(row('Mixed by')).toHaveTextContent('Wren Ashby');
    expect(row('Mixed')).toHaveTextContent('2027-03-04 14:05');
    expect(row('Use by')).toHaveTextContent('2027-03-04 14:30');
    expect(label).toHaveTextContent(material.name);
    expect(within(label).getByText('GO')).toBeInTheDocument();

    const url = `${window.location.origin}/review/batches/42`;
    const qr = within(label).getByTitle(url).closest('svg');
    expect(qr).not.toBeNull();
    // The code itself: more than a few dark modules drawn.
    expect(qr!.querySelectorAll('path')[1]?.getAttribute('d')?.length).toBeGreaterThan(200);

    fireEvent.click(screen.getByRole('button', { name: 'Print label' }));
    expect(print).toHaveBeenCalledTimes(1);
  });

  it('lets the operator tick the mixing steps off', () => {
    render(<SavedBatch batch={savedBatch()} material={material} />);
    const steps = screen.getByRole('region', { name: 'Mixing steps' });
    const first = within(steps).getByRole('checkbox', { name: '1. Mix part A and part B' });
    expect(first).toHaveAccessibleDescription(/scraping the sides and the bottom/);
    expect(within(steps).getByText('0 of 4 done')).toBeInTheDocument();
    fireEvent.click(first);
    expect(first).toBeChecked();
    expect(within(steps).getByText('1 of 4 done')).toBeInTheDocument();
    for (const name of ['2. Transfer to a second clean cup', '3. Mix again', '4. Pour']) {
      fireEvent.click(within(steps).getByRole('checkbox', { name }));
    }
    expect(within(steps).getByText('All done')).toBeInTheDocument();
    fireEvent.click(first);
    expect(first).not.toBeChecked();
    expect(within(steps).getByText('3 of 4 done')).toBeInTheDocument();
  });

  it('lists the material cautions and defers to its safety data sheet', () => {
    render(<SavedBatch batch={savedBatch()} material={material} />);
    const safety = screen.getByRole('region', { name: 'Handle with care' });
    expect(safety).toHaveTextContent(material.cautions[0]!);
    expect(safety).toHaveTextContent('safety data sheet (SDS binder, tab 3)');
    expect(safety).toHaveTextContent('local rules come first');
  });
});
