import { describe, expect, it } from 'vitest';
import { contentsAfterRestart, contentsToleranceG } from './cup-contents.js';

/** LR-27 at 100 : 27 by weight in a 40 g lined cup, part A tared at 40 g gross, then 26.04 g in. */
const base = {
  tareGrossG: 40,
  stable: true,
  readabilityG: 0.01,
  lastTraceNetG: 14.77,
} as const;

describe('what is in the cup after a restart', () => {
  it('takes the display as the pour when the balance prints net (it kept the tare)', () => {
    const c = contentsAfterRestart({
      ...base,
      displayG: 26.04,
      lineMode: 'net',
      softwareTare: false,
    });
    // The cup holds 26.04 g, not the 14.77 g the last trace point says.
    expect(c).toEqual({
      known: true,
      pouredG: 26.04,
      how: expect.stringMatching(/holds the tare/),
    });
  });

  it('takes display − stored gross when the balance prints gross', () => {
    const c = contentsAfterRestart({
      ...base,
      displayG: 66.04,
      lineMode: 'gross',
      softwareTare: false,
    });
    expect(c.known && c.pouredG).toBeCloseTo(26.04, 6);
  });

  it('takes display − stored gross for a family without a tare command (the tare was the hub’s)', () => {
    const c = contentsAfterRestart({
      ...base,
      displayG: 66.04,
      lineMode: 'unknown',
      softwareTare: true,
    });
    expect(c.known && c.pouredG).toBeCloseTo(26.04, 6);
  });

  it('decides a line that does not say, when only one meaning fits the record', () => {
    // 26.04 g displayed: as a kept tare, 26.04 g poured (≥ 14.77 g written); as a lost one,
    // 26.04 − 40 = −13.96 g, impossible.
    const c = contentsAfterRestart({
      ...base,
      displayG: 26.04,
      lineMode: 'unknown',
      softwareTare: false,
    });
    expect(c.known && c.pouredG).toBeCloseTo(26.04, 6);
  });

  it('is uncertain when a line that does not say fits both meanings', () => {
    const c = contentsAfterRestart({
      ...base,
      displayG: 66.04,
      lineMode: 'unknown',
      softwareTare: false,
    });
    expect(c.known).toBe(false);
  });

  it('is uncertain when the cup holds less than the record already wrote (cup moved, re-tared)', () => {
    const c = contentsAfterRestart({ ...base, displayG: 3, lineMode: 'net', softwareTare: false });
    expect(c).toMatchObject({ known: false, why: expect.stringMatching(/fits neither/) });
  });

  it('is uncertain while the reading moves, and without a stored tare', () => {
    expect(
      contentsAfterRestart({
        ...base,
        displayG: 26,
        stable: false,
        lineMode: 'net',
        softwareTare: false,
      }).known,
    ).toBe(false);
    expect(
      contentsAfterRestart({
        ...base,
        tareGrossG: undefined,
        displayG: 26,
        lineMode: 'net',
        softwareTare: false,
      }).known,
    ).toBe(false);
  });

  it('allows max(0.5 g, 2 d): 0.5 g on a 0.01 g balance, 2 g on a 1 g one', () => {
    expect(contentsToleranceG(0.01)).toBe(0.5);
    expect(contentsToleranceG(1)).toBe(2);
  });
});
