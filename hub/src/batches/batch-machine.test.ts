import { describe, expect, it } from 'vitest';
import {
  abandon,
  BatchRefusal,
  confirmPour,
  interrupt,
  judge,
  judgeSteady,
  markTared,
  type HeldZone,
  resume,
  saveNoGo,
  startBatch,
  takeRescue,
  type BatchRecord,
} from './batch-machine.js';

const T0 = '2026-12-02T08:00:00.000Z';
const steady = (netG: number) => ({ netG, stable: true });
const moving = (netG: number) => ({ netG, stable: false });

/** A 100:14 by weight epoxy, 114 g planned, ±1 % (common practice, no published source). */
function epoxy(overrides: Partial<Parameters<typeof startBatch>[0]> = {}): BatchRecord {
  return startBatch({
    weightRatio: [100, 14],
    partLabels: ['Resin', 'Hardener'],
    tolerancePct: 1,
    readabilityG: 0.01,
    totalMassG: 114,
    lots: [],
    now: T0,
    ...overrides,
  });
}

function refusal(fn: () => unknown): BatchRefusal {
  try {
    fn();
  } catch (err) {
    if (err instanceof BatchRefusal) return err;
    throw err;
  }
  throw new Error('expected a refusal');
}

/** Part A poured and confirmed at `a` grams, scale re-tared for part B. */
function atPartB(a = 100): BatchRecord {
  const rec = confirmPour(markTared(epoxy(), T0), steady(a), T0);
  return markTared(rec, T0);
}

describe('batch state machine: the normal path', () => {
  it('starts in weighing-a with targets split by the ratio', () => {
    const rec = epoxy();
    expect(rec.state).toBe('weighing-a');
    // 114 g at 100:14 → 100 g + 14 g (arithmetic of parts by weight).
    expect(rec.parts.map((p) => p.targetG)).toEqual([100, 14]);
    // Part A has a band too, ±1 % of 100 g → 99–101 g, shown as advice.
    expect(rec.active).toMatchObject({ part: 0, kind: 'first', tared: false });
    expect(rec.active!.band!.lowG).toBeCloseTo(99, 10);
    expect(rec.active!.band!.highG).toBeCloseTo(101, 10);
  });

  it('gives part A a verdict but accepts it outside its band, and never while it moves', () => {
    const tared = markTared(epoxy(), T0);
    expect(judge(tared, steady(100.5))).toBe('GO');
    expect(judge(tared, steady(102))).toBe('OVER');
    // Part A sets the scale of the rest: 102 g is taken, part B follows it (102 × 14 / 100).
    expect(confirmPour(tared, steady(102), T0).active!.targetG).toBeCloseTo(14.28, 10);
    expect(refusal(() => confirmPour(tared, moving(100), T0)).code).toBe('NOT_STABLE');
    // Nothing to rescue on part A's own pour.
    expect(refusal(() => takeRescue(tared, steady(102), T0)).code).toBe('NOT_OVER');
  });

  it('recomputes the part B target from part A as poured', () => {
    const rec = confirmPour(markTared(epoxy(), T0), steady(101.5), T0);
    expect(rec.state).toBe('weighing-b');
    // 101.5 × 14 / 100 = 14.21 g; band ± 1 % → 14.0679–14.3521 g.
    expect(rec.active!.targetG).toBeCloseTo(14.21, 10);
    expect(rec.active!.band!.lowG).toBeCloseTo(14.0679, 10);
    expect(rec.active!.band!.highG).toBeCloseTo(14.3521, 10);
    expect(rec.parts[1]!.targetG).toBeCloseTo(14.21, 10);
    expect(rec.active!.tared).toBe(false);
  });

  it('saves GO at 100.0 g then 14.10 g, deviation about +0.71 %', () => {
    const rec = confirmPour(atPartB(100), steady(14.1), T0);
    expect(rec.state).toBe('saved');
    expect(rec.verdict).toBe('GO');
    // (14.10 / 100) / (14 / 100) − 1 = +0.714 % (worked by hand from the definition of parts by weight).
    expect(rec.ratioDeviationPct).toBeCloseTo(0.7143, 3);
    expect(rec.parts.map((p) => p.actualG)).toEqual([100, 14.1]);
    expect(rec.steps.saved).toBe(T0);
  });

  it('judges part B readings UNDER, SETTLING, GO and OVER, and none before the tare', () => {
    const untared = confirmPour(markTared(epoxy(), T0), steady(100), T0);
    expect(judge(untared, steady(14))).toBeNull();
    const rec = markTared(untared, T0);
    // Band for 14 g at ±1 %: 13.86–14.14 g (common practice, no published source).
    expect(judge(rec, steady(13.85))).toBe('UNDER');
    expect(judge(rec, moving(14.0))).toBe('SETTLING');
    expect(judge(rec, steady(13.86))).toBe('GO');
    expect(judge(rec, steady(14.14))).toBe('GO');
    expect(judge(rec, steady(14.15))).toBe('OVER');
  });

  it('runs a three-part system through weighing-c', () => {
    let rec = startBatch({
      weightRatio: [100, 50, 10],
      partLabels: ['A', 'B', 'C'],
      tolerancePct: 2,
      readabilityG: 0.1,
      totalMassG: 160,
      lots: [],
      now: T0,
    });
    rec = markTared(rec, T0);
    rec = markTared(confirmPour(rec, steady(80), T0), T0);
    expect(rec.state).toBe('weighing-b');
    expect(rec.active!.targetG).toBe(40);
    rec = markTared(confirmPour(rec, steady(40.4), T0), T0);
    expect(rec.state).toBe('weighing-c');
    // C follows part A as poured: 80 × 10 / 100 = 8 g.
    expect(rec.active!.targetG).toBe(8);
    rec = confirmPour(rec, steady(8.1), T0);
    expect(rec.state).toBe('saved');
    expect(rec.verdict).toBe('GO');
  });
});

describe('batch state machine: refusals', () => {
  it('refuses to confirm before the tare, while unsteady, or with nothing poured', () => {
    expect(refusal(() => confirmPour(epoxy(), steady(100), T0)).code).toBe('NOT_TARED');
    const tared = markTared(epoxy(), T0);
    expect(refusal(() => confirmPour(tared, moving(100), T0)).code).toBe('NOT_STABLE');
    expect(refusal(() => confirmPour(tared, undefined, T0)).code).toBe('NOT_STABLE');
    expect(refusal(() => confirmPour(tared, steady(0), T0)).code).toBe('NOTHING_POURED');
  });

  it('refuses to confirm part B outside its band', () => {
    const rec = atPartB();
    expect(refusal(() => confirmPour(rec, steady(13.5), T0)).message).toMatch(/pour a little more/);
    expect(refusal(() => confirmPour(rec, steady(14.5), T0)).message).toMatch(/rescue/);
  });

  it('refuses every pour once saved or abandoned, and a second abandon', () => {
    const saved = confirmPour(atPartB(), steady(14), T0);
    expect(refusal(() => confirmPour(saved, steady(1), T0)).code).toBe('WRONG_STATE');
    expect(refusal(() => markTared(saved, T0)).code).toBe('WRONG_STATE');
    expect(refusal(() => abandon(saved, 'spilled', undefined, T0)).code).toBe('WRONG_STATE');
    const gone = abandon(epoxy(), 'spilled the cup', undefined, T0);
    expect(refusal(() => abandon(gone, 'again', undefined, T0)).code).toBe('WRONG_STATE');
    expect(refusal(() => resume(gone, { lost: false }, T0)).code).toBe('WRONG_STATE');
  });

  it('refuses a rescue when nothing is over', () => {
    expect(refusal(() => takeRescue(atPartB(), steady(14), T0)).code).toBe('NOT_OVER');
  });
});

describe('batch state machine: over-pour and rescue', () => {
  it('offers 3.57 g of part A for 14.5 g of part B on 100 g, and judges the top-up', () => {
    const rec = takeRescue(atPartB(100), steady(14.5), T0);
    // 14.5 × 100 / 14 = 103.571 g of A needed → add 3.571 g (worked by hand from the definition of parts by weight).
    expect(rec.rescue!.addG[0]).toBeCloseTo(3.5714, 3);
    expect(rec.rescue!.addG[1]).toBe(0);
    expect(rec.state).toBe('weighing-a');
    expect(rec.active).toMatchObject({ part: 0, kind: 'top-up', tared: false });
    expect(rec.active!.targetG).toBeCloseTo(3.5714, 3);
    // A total within [103.571/1.01, 103.571/0.99] keeps B within ±1 % of A's ratio.
    expect(rec.active!.band!.lowG).toBeCloseTo(103.5714 / 1.01 - 100, 3);
    expect(rec.active!.band!.highG).toBeCloseTo(103.5714 / 0.99 - 100, 3);
    const saved = confirmPour(markTared(rec, T0), steady(3.57), T0);
    expect(saved.state).toBe('saved');
    expect(saved.verdict).toBe('GO');
    expect(saved.parts[0]!.actualG).toBeCloseTo(103.57, 10);
    expect(Math.abs(saved.ratioDeviationPct!)).toBeLessThan(0.01);
  });

  it('refuses a rescue that does not fit on the scale', () => {
    const err = refusal(() =>
      takeRescue(atPartB(100), steady(14.5), T0, { capacityG: 200, grossG: 198 }),
    );
    expect(err.code).toBe('RESCUE_DOES_NOT_FIT');
  });

  it('saves an over-pour as NO-GO with what is in the cup', () => {
    const rec = saveNoGo(atPartB(100), steady(14.5), T0);
    expect(rec.state).toBe('saved');
    expect(rec.verdict).toBe('NO-GO');
    // (14.5 / 100) / 0.14 − 1 = +3.571 %.
    expect(rec.ratioDeviationPct).toBeCloseTo(3.5714, 3);
  });
});

describe('batch state machine: abandon, interrupt, resume', () => {
  it('keeps what was weighed when abandoned', () => {
    const rec = abandon(atPartB(100), 'cup tipped over', steady(6), T0);
    expect(rec.state).toBe('abandoned');
    expect(rec.abandonReason).toBe('cup tipped over');
    expect(rec.parts.map((p) => p.actualG)).toEqual([100, 6]);
  });

  it('interrupts a weighing batch and resumes it where it was', () => {
    const rec = interrupt(atPartB(100), 'scale offline', T0);
    expect(rec.state).toBe('interrupted');
    expect(refusal(() => confirmPour(rec, steady(14), T0)).code).toBe('WRONG_STATE');
    const back = resume(rec, { lost: false }, T0);
    expect(back.state).toBe('weighing-b');
    expect(back.active!.tared).toBe(true);
    expect(confirmPour(back, steady(14.05), T0).verdict).toBe('GO');
  });

  it('keeps every interruption and resume in the steps, not only the last', () => {
    const T1 = '2027-01-05T09:05:00.000Z';
    const once = resume(interrupt(atPartB(100), 'scale offline', T0), { lost: false }, T0);
    const twice = resume(interrupt(once, 'scale offline again', T1), { lost: false }, T1);
    expect(twice.steps).toMatchObject({
      interrupted: T0,
      resumed: T0,
      'interrupted.2': T1,
      'resumed.2': T1,
    });
  });

  it('credits the pour reached before a lost tare and shrinks the rest', () => {
    const rec = interrupt(atPartB(100), 'hub restarted', T0);
    const back = resume(rec, { lost: true, creditG: 10 }, T0);
    expect(back.parts[1]!.actualG).toBe(10);
    expect(back.active!.tared).toBe(false);
    expect(back.active!.targetG).toBeCloseTo(4, 10);
    expect(back.active!.band!.lowG).toBeCloseTo(3.86, 10);
    const saved = confirmPour(markTared(back, T0), steady(4.05), T0);
    expect(saved.parts[1]!.actualG).toBeCloseTo(14.05, 10);
    expect(saved.verdict).toBe('GO');
  });

  it('can only end NO-GO once its contents were uncertain after a restart', () => {
    const rec = interrupt(atPartB(100), 'hub restarted', T0);
    const back = resume(
      rec,
      { lost: true, creditG: 10, uncertain: 'contents uncertain after a restart' },
      T0,
    );
    // Inside the band by the scale, and still NO-GO: nobody knows what the cup really holds.
    const saved = confirmPour(markTared(back, T0), steady(4.05), T0);
    expect(saved.state).toBe('saved');
    expect(saved.verdict).toBe('NO-GO');
    expect(saved.noGoReason).toBe('contents uncertain after a restart');
  });

  it('leaves a saved batch alone when interrupted', () => {
    const saved = confirmPour(atPartB(), steady(14), T0);
    expect(interrupt(saved, 'scale offline', T0)).toBe(saved);
  });
});

describe('the verdict without flicker (hysteresis of one scale interval)', () => {
  // The bench's own case: part B 0.42 g on a 0.01 g scale, band ±1 % → 0.4158–0.4242 g, so only
  // the reading 0.42 is inside; 0.41 is UNDER and 0.43 OVER.
  const band = { lowG: 0.4158, highG: 0.4242 };
  const d = 0.01;

  function run(readings: number[]): string[] {
    let held: HeldZone | null = null;
    return readings.map((netG) => {
      const next = judgeSteady(held, steady(netG), band, d);
      held = next.held;
      return next.verdict;
    });
  }

  it('holds its verdict while the reading dithers by one interval across an edge', () => {
    // 0.41 UNDER; 0.42 is 0.01 from 0.41, not more than d: still UNDER. 0.43 is 0.02 from the
    // last UNDER reading: OVER. From then on 0.42/0.43 is one interval of dither: OVER holds.
    expect(run([0.4, 0.41, 0.42, 0.43, 0.42, 0.43, 0.42, 0.43, 0.43, 0.42])).toEqual([
      'UNDER',
      'UNDER',
      'UNDER',
      'OVER',
      'OVER',
      'OVER',
      'OVER',
      'OVER',
      'OVER',
      'OVER',
    ]);
    // Reached GO from 0.40 (0.02 away), the same dither keeps GO.
    expect(run([0.4, 0.42, 0.43, 0.42, 0.43, 0.42])).toEqual([
      'UNDER',
      'GO',
      'GO',
      'GO',
      'GO',
      'GO',
    ]);
  });

  it('never changes more than once while a reading dithers by one interval', () => {
    for (const start of [0.41, 0.42, 0.43]) {
      const dither = Array.from({ length: 40 }, (_, i) => (i % 2 === 0 ? start : start + d));
      const verdicts = run(dither);
      const changes = verdicts.filter((v, i) => i > 0 && v !== verdicts[i - 1]).length;
      expect(changes).toBe(0);
    }
  });

  it('follows a reading that moves by more than one interval', () => {
    // 0.40 UNDER, 0.42 is 0.02 from 0.40 → GO, 0.44 is 0.02 from 0.42 → OVER, back to 0.42 → GO.
    expect(run([0.4, 0.42, 0.44, 0.42])).toEqual(['UNDER', 'GO', 'OVER', 'GO']);
  });

  it('without hysteresis the same dither flips GO and OVER at every reading', () => {
    const raw = [0.42, 0.43, 0.42, 0.43].map((g) => (g > band.highG ? 'OVER' : 'GO'));
    expect(raw).toEqual(['GO', 'OVER', 'GO', 'OVER']);
  });

  it('shows SETTLING inside the band while the reading moves', () => {
    expect(judgeSteady(null, moving(0.42), band, d).verdict).toBe('SETTLING');
  });
});
