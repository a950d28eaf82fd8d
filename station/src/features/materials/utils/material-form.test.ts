import { describe, expect, it } from 'vitest';
import { materialFormSchema, toFormValues, toPatch } from './material-form';

describe('the material form', () => {
  it('reads typed text into the schema: decimal commas, blank boxes and one caution per line', () => {
    const v = toFormValues();
    v.name = 'Hollin pour urethane';
    v.ratio = { basis: 'volume', parts: ['1', '1', ''] };
    v.alsoStatedRatio.parts = ['100', '89', ''];
    v.partSpecificGravities = ['1,10', '0.98', ''];
    v.costPerKg = ['18.5', '16', ''];
    v.cautions = 'Wear gloves\n\n  Ventilate  ';
    const out = materialFormSchema.parse(v);
    expect(out).toMatchObject({
      ratio: { basis: 'volume', parts: [1, 1] },
      alsoStatedRatio: { basis: 'weight', parts: [100, 89] },
      partSpecificGravities: [1.1, 0.98],
      costPerKg: [18.5, 16],
      cautions: ['Wear gloves', 'Ventilate'],
    });
    expect(out.lowStockG).toBeUndefined();
    expect(toPatch(out)).toMatchObject({ lowStockG: null, demoldMin: null, costPerKg: [18.5, 16] });
  });

  it('names the box that is off: a half-filled list, or a ratio that disagrees with the SGs', () => {
    const v = toFormValues();
    v.name = 'x';
    v.ratio.parts = ['1', '1', ''];
    v.ratio.basis = 'volume';
    v.partSpecificGravities = ['1.10', '0.98', ''];
    v.alsoStatedRatio.parts = ['100', '85', ''];
    v.lowStockG = ['500', '', ''];
    const r = materialFormSchema.safeParse(v);
    const paths = r.error!.issues.map((i) => i.path.join('.'));
    expect(paths).toContain('lowStockG.1');
    v.lowStockG = ['', '', ''];
    const disagree = materialFormSchema.safeParse(v);
    expect(disagree.error!.issues[0]!.path.join('.')).toBe('alsoStatedRatio.parts.1');
    expect(disagree.error!.issues[0]!.message).toMatch(/^Part B is off/);
  });
});
