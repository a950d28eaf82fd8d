import { describe, expect, it } from 'vitest';
import { statusOf } from '../common/api-exception.filter.js';
import { InvalidInput } from '../common/domain-errors.js';
import { PlanService } from './plan.service.js';

describe('PlanService', () => {
  it('turns bad input that slipped past the schema into a 400 naming the field', () => {
    const service = new PlanService();
    const call = () =>
      service.compute({
        cavity: { shape: 'water', waterMassG: 850, waterTempC: 60 },
        overagePct: 0,
        cupLossG: 0,
        tolerancePct: 1,
        material: { ratio: { basis: 'weight', parts: [100, 14] }, specificGravity: 1.2 },
      });
    expect(call).toThrow(InvalidInput);
    try {
      call();
    } catch (err) {
      expect(statusOf(err as InvalidInput)).toBe(400);
      expect((err as InvalidInput).message).toBe('The plan request has mistakes');
      expect((err as InvalidInput).errors).toEqual([
        {
          path: 'cavity.waterTempC',
          message:
            'The water temperature must be between 0 and 40 °C; the density table covers only that range',
        },
      ]);
    }
  });
});
