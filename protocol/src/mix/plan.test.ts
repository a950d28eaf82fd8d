import { describe, expect, it } from 'vitest';
import {
  CM3_PER_IN3,
  computePlan,
  fieldErrors,
  MixInputError,
  planRequestSchema,
  planResponseSchema,
  type PlanRequestInput,
} from '../index.js';

const epoxy = { ratio: { basis: 'weight' as const, parts: [100, 14] }, specificGravity: 1.2 };

function plan(input: PlanRequestInput) {
  return planResponseSchema.parse(computePlan(planRequestSchema.parse(input)));
}

function badFields(input: unknown): Record<string, string> {
  const result = planRequestSchema.safeParse(input);
  expect(result.success).toBe(false);
  return Object.fromEntries(fieldErrors(result.error!).map((e) => [e.path, e.message]));
}

describe('computePlan', () => {
  it('walks cavity → net → fill → mass → cup loss → parts', () => {
    const p = plan({
      cavity: { shape: 'box', length: 10, width: 8, height: 3, unit: 'in' },
      displacement: { volume: 60, unit: 'in3' },
      overagePct: 10,
      cupLossG: 15,
      material: epoxy,
    });
    // Arithmetic on the definitions: 240 in³ − 60 in³ = 180 in³; × 1.10 = 198 in³.
    expect(p.cavityVolumeIn3).toBeCloseTo(240, 10);
    expect(p.netVolumeIn3).toBeCloseTo(180, 10);
    expect(p.fillVolumeIn3).toBeCloseTo(198, 10);
    // 198 in³ × 16.387 064 cm³/in³ (1959 inch) × SG 1.2 = 3893.566 g; + 15 g cup loss.
    expect(p.fillMassG).toBeCloseTo(198 * CM3_PER_IN3 * 1.2, 9);
    expect(p.totalMassG).toBeCloseTo(3893.566 + 15, 3);
    // Split 100:14.
    expect(p.parts.map((x) => x.name)).toEqual(['A', 'B']);
    expect(p.parts[0]!.massG).toBeCloseTo((p.totalMassG * 100) / 114, 9);
    expect(p.parts[0]!.massG + p.parts[1]!.massG).toBeCloseTo(p.totalMassG, 9);
    // ±1 % by default.
    expect(p.parts[1]!.lowG).toBeCloseTo(p.parts[1]!.massG * 0.99, 9);
    expect(p.tolerancePct).toBe(1);
    expect(p.minNetWeightG).toBeUndefined();
    expect(p.warnings.map((w) => w.code)).toEqual(['PART_VOLUMES_FROM_MIX_SG']);
  });

  it('uses the yield in in³/lb the same as the SG it stands for', () => {
    const bySg = plan({ cavity: { shape: 'volume', volume: 500, unit: 'cm3' }, material: epoxy });
    const byYield = plan({
      cavity: { shape: 'volume', volume: 500, unit: 'cm3' },
      // NIST SP 811 (via 27.68 in³/lb at SG 1): SG 1.2 ↔ 27.6799 / 1.2 in³/lb.
      material: { ratio: epoxy.ratio, yieldIn3PerLb: 27.67990471 / 1.2 },
    });
    expect(byYield.totalMassG).toBeCloseTo(bySg.totalMassG, 5);
    expect(bySg.totalMassG).toBeCloseTo(600, 10);
  });

  it('plans a ratio by volume with part SGs, giving true part volumes', () => {
    const p = plan({
      cavity: { shape: 'cylinder', diameter: 100, height: 50, unit: 'mm' },
      material: { ratio: { basis: 'volume', parts: [1, 1] }, partSpecificGravities: [1.1, 0.98] },
    });
    // 1:1 by volume: equal part volumes, each half the fill (π × 5² × 5 / 2 cm³).
    expect(p.parts[0]!.volumeCm3).toBeCloseTo(p.parts[1]!.volumeCm3, 9);
    expect(p.parts[0]!.volumeCm3).toBeCloseTo((Math.PI * 25 * 5) / 2, 9);
    expect(p.specificGravity).toBeCloseTo(1.04, 12);
    expect(p.warnings).toEqual([]);
  });

  it('plans from water weighed into the cavity', () => {
    const p = plan({
      cavity: { shape: 'water', waterMassG: 850, waterTempC: 22 },
      material: epoxy,
    });
    // Kell (ITS-90 form) at 22 °C: 0.997769 g/cm³.
    expect(p.cavityVolumeCm3).toBeCloseTo(850 / 0.997769, 6);
  });

  it('warns when the scale is too coarse for the smallest part, or the mix too heavy', () => {
    const p = plan({
      cavity: { shape: 'volume', volume: 50, unit: 'cm3' },
      material: epoxy,
      scale: { readabilityG: 0.1, capacityG: 60, cupMassG: 5 },
    });
    // 50 cm³ × 1.2 = 60 g; part B = 60 × 14 / 114 = 7.37 g, below 82 d = 8.2 g (USP <41> at 1 %).
    expect(p.minNetWeightG).toBeCloseTo(8.2, 10);
    const codes = p.warnings.map((w) => w.code);
    expect(codes).toContain('SCALE_TOO_COARSE');
    expect(codes).toContain('OVER_CAPACITY');
    expect(p.warnings.find((w) => w.code === 'SCALE_TOO_COARSE')!.message).toMatch(
      /^Part B \(7\.37 g\) is below the smallest mass this scale weighs within ±1 % \(8\.20 g\)/,
    );
    const fine = plan({
      cavity: { shape: 'volume', volume: 500, unit: 'cm3' },
      material: epoxy,
      scale: { readabilityG: 0.1, capacityG: 4000 },
    });
    expect(fine.warnings.map((w) => w.code)).not.toContain('SCALE_TOO_COARSE');
    expect(fine.warnings.map((w) => w.code)).not.toContain('OVER_CAPACITY');
  });

  it('throws MixInputError naming the field when called without the schema', () => {
    try {
      computePlan({
        cavity: { shape: 'box', length: 1, width: 1, height: 1, unit: 'in' },
        displacement: { volume: 2, unit: 'in3' },
        overagePct: 0,
        cupLossG: 0,
        tolerancePct: 1,
        material: epoxy,
      });
      expect.unreachable();
    } catch (err) {
      expect(err).toBeInstanceOf(MixInputError);
      expect((err as MixInputError).field).toBe('displacement.volume');
    }
  });
});

describe('planRequestSchema', () => {
  it('names every bad field with words an operator understands', () => {
    expect(
      badFields({
        cavity: { shape: 'box', length: 0, width: 'wide', unit: 'ft' },
        overagePct: -5,
        material: { ratio: { basis: 'weight', parts: [100, 0] } },
      }),
    ).toEqual({
      'cavity.length': 'The length must be more than zero',
      'cavity.width': 'The width must be a number',
      'cavity.height': 'Enter the height',
      'cavity.unit': 'Choose a length unit: in, mm, cm',
      overagePct: 'The overage cannot be negative',
      'material.ratio.parts.1': 'The ratio part must be more than zero',
      'material.specificGravity': "Enter the material's specific gravity or its yield",
    });
  });

  it('refuses an unknown shape, a model larger than the cavity and water out of the table', () => {
    expect(badFields({ cavity: { shape: 'sphere' }, material: epoxy })).toEqual({
      'cavity.shape': 'Choose a cavity shape: box, cylinder, frustum, volume, water',
    });
    expect(
      badFields({
        cavity: { shape: 'volume', volume: 10, unit: 'in3' },
        displacement: { volume: 12, unit: 'in3' },
        material: epoxy,
      }),
    ).toEqual({
      'displacement.volume':
        'The model takes up as much room as the cavity or more: check both measurements',
    });
    expect(
      badFields({ cavity: { shape: 'water', waterMassG: 850, waterTempC: 55 }, material: epoxy }),
    ).toEqual({ 'cavity.waterTempC': 'The water temperature must be between 0 and 40 °C' });
  });

  it('refuses a ratio by volume without part SGs, and SG with yield together', () => {
    expect(
      badFields({
        cavity: { shape: 'volume', volume: 10, unit: 'L' },
        material: {
          ratio: { basis: 'volume', parts: [1, 1] },
          specificGravity: 1,
          yieldIn3PerLb: 27,
        },
      }),
    ).toEqual({
      'material.yieldIn3PerLb': 'Give the specific gravity or the yield, not both',
      'material.partSpecificGravities': "A ratio by volume needs each part's specific gravity",
    });
    expect(
      badFields({
        cavity: { shape: 'cylinder', radius: 1, diameter: 2, height: 1, unit: 'in' },
        material: { ...epoxy, ratio: { basis: 'weight', parts: [1, 2, 3, 4] } },
      }),
    ).toEqual({
      'cavity.radius': 'Give the diameter or the radius, not both',
      'material.ratio.parts': 'A mix ratio has 2 or 3 parts',
    });
  });

  it('refuses a body that is not an object', () => {
    expect(badFields('nope')).toEqual({ '(body)': 'Send the plan request as a JSON object' });
    expect(
      badFields({ cavity: { shape: 'box', length: 1, width: 1, height: 1, unit: 'in' } }),
    ).toEqual({
      material: "Enter the material's mix ratio and specific gravity",
    });
  });
});
