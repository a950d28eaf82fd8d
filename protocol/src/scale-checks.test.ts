import { std } from 'mathjs';
import { describe, expect, it } from 'vitest';
import {
  benchPolicyPatchSchema,
  checkDue,
  checkToleranceG,
  judgeRoutineCheck,
  repeatabilityOf,
  sampleStandardDeviation,
} from './scale-checks.js';

// Ten placements of a 100 g weight on a 0.01 g balance: deviations from 100 g of
// 0, +1, −1, 0, +2, 0, −1, +1, 0, −2 hundredths.
const TEN = [100.0, 100.01, 99.99, 100.0, 100.02, 100.0, 99.99, 100.01, 100.0, 99.98];

describe('sample standard deviation', () => {
  it('divides by n − 1 (NIST/SEMATECH e-Handbook of Statistical Methods, 1.3.5.6)', () => {
    // By hand: mean 100.00; squares sum to 12e-4 g²; / 9 = 1.3333e-4; √ = 0.011 547 g.
    expect(sampleStandardDeviation(TEN)).toBeCloseTo(0.011547005, 8);
  });

  it('agrees with mathjs std (unbiased, n − 1)', () => {
    const readings = [
      20.013, 20.011, 20.016, 20.012, 20.014, 20.01, 20.015, 20.013, 20.012, 20.017,
    ];
    expect(sampleStandardDeviation(readings)).toBeCloseTo(Number(std(readings)), 12);
    expect(sampleStandardDeviation(TEN)).toBeCloseTo(Number(std(TEN)), 12);
  });

  it('needs two readings at least', () => {
    expect(() => sampleStandardDeviation([1])).toThrow(RangeError);
  });
});

describe('repeatability and the minimum net mass', () => {
  it('uses the measured s when it is above 0.41 d: m_min = 2 s / band', () => {
    const r = repeatabilityOf(TEN, 0.01, 0.01);
    expect(r.sdG).toBeCloseTo(0.011547005, 8);
    expect(r.sdUsedG).toBeCloseTo(0.011547005, 8);
    // 2 × 0.011 547 / 0.01 = 2.3094 g (hand calculation).
    expect(r.minNetG).toBeCloseTo(2.309401, 5);
  });

  it('never takes s below 0.41 d (USP General Chapter <41>)', () => {
    // Nine readings of 50.00 and one of 50.01: mean 50.001, squares 9 × 1e-6 + 8.1e-5 = 9e-5 g²,
    // / 9 = 1e-5, s = 0.003 162 g — under 0.41 × 0.01 = 0.0041 g, so 0.0041 g is used.
    const r = repeatabilityOf([...Array<number>(9).fill(50), 50.01], 0.01, 0.01);
    expect(r.sdG).toBeCloseTo(0.0031623, 6);
    expect(r.sdUsedG).toBeCloseTo(0.0041, 10);
    // 2 × 0.0041 / 0.01 = 0.82 g = 82 d: the USP floor applied to a ±1 % band (REFERENCES.md).
    expect(r.minNetG).toBeCloseTo(0.82, 10);
  });

  it('floors a perfectly repeatable scale at 0.41 d too (8.2 g at 0.1 % for d = 0.01 g, USP <41>)', () => {
    const r = repeatabilityOf(Array<number>(10).fill(200), 0.01, 0.001);
    expect(r.sdG).toBe(0);
    expect(r.minNetG).toBeCloseTo(8.2, 10);
  });
});

describe('routine check tolerance and verdict', () => {
  it('defaults to 0.1 % of the reference (USP <41> accuracy) when that is over 2 d', () => {
    expect(checkToleranceG(200, 0.01)).toBeCloseTo(0.2, 12);
  });

  it('is never under 2 d (common practice, no published source)', () => {
    expect(checkToleranceG(10, 0.01)).toBeCloseTo(0.02, 12);
  });

  it("takes the bench's own tolerance when one is set", () => {
    expect(checkToleranceG(200, 0.01, 0.05)).toBe(0.05);
  });

  it('passes an error within the tolerance, edge included, and fails beyond it', () => {
    expect(judgeRoutineCheck(200.15, 200, 0.2)).toEqual({ errorG: 0.15, passed: true });
    expect(judgeRoutineCheck(9.98, 10, 0.02)).toEqual({ errorG: -0.02, passed: true });
    expect(judgeRoutineCheck(10.03, 10, 0.02)).toEqual({ errorG: 0.03, passed: false });
    expect(judgeRoutineCheck(199.79, 200, 0.2)).toEqual({ errorG: -0.21, passed: false });
  });
});

describe('when a check is due', () => {
  const H = 3_600_000;
  it('is due when a schedule has no passed check yet', () => {
    expect(checkDue({ checkEveryHours: 8, lastPassedAt: null, lastFailed: false }, 0)).toEqual({
      due: true,
      reason: 'never-checked',
      nextDueAt: null,
    });
  });

  it('stays good for checkEveryHours after a passed check, then is due', () => {
    const history = { checkEveryHours: 8, lastPassedAt: 1000, lastFailed: false };
    expect(checkDue(history, 1000 + 8 * H - 1).due).toBe(false);
    expect(checkDue(history, 1000 + 8 * H)).toEqual({
      due: true,
      reason: 'expired',
      nextDueAt: 1000 + 8 * H,
    });
  });

  it('is due after a failed check, schedule or not', () => {
    expect(
      checkDue({ checkEveryHours: null, lastPassedAt: 1000, lastFailed: true }, 2000).reason,
    ).toBe('last-failed');
    expect(checkDue({ checkEveryHours: null, lastPassedAt: null, lastFailed: false }, 0).due).toBe(
      false,
    );
  });
});

describe('bench policy patch', () => {
  it('accepts a partial patch and clears with null', () => {
    expect(benchPolicyPatchSchema.parse({ checkEveryHours: 8, calibrationDueOn: null })).toEqual({
      checkEveryHours: 8,
      calibrationDueOn: null,
    });
  });

  it('refuses an empty patch, unknown fields, fractions of hours and dates that do not exist', () => {
    expect(benchPolicyPatchSchema.safeParse({}).success).toBe(false);
    expect(benchPolicyPatchSchema.safeParse({ name: 'x' }).success).toBe(false);
    expect(benchPolicyPatchSchema.safeParse({ checkEveryHours: 1.5 }).success).toBe(false);
    expect(benchPolicyPatchSchema.safeParse({ calibrationDueOn: '2027-02-30' }).success).toBe(
      false,
    );
  });
});
