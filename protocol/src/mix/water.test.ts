import { describe, expect, it } from 'vitest';
import {
  cavityVolumeCm3,
  MixInputError,
  WATER_DENSITY_KG_M3,
  waterDensityGPerCm3,
  waterFillVolumeCm3,
} from '../index.js';

/**
 * The CIPM formula for the density of pure water (Tanaka, Girard, Davis, Peuto and Bignell,
 * Metrologia 38 (2001) 301), kg/m³; coefficients from memory. An oracle independent of Kell's.
 */
function tanakaKgM3(t: number): number {
  const [a1, a2, a3, a4, a5] = [-3.983035, 301.797, 522528.9, 69.34881, 999.97495];
  return a5 * (1 - ((t + a1) ** 2 * (t + a2)) / (a3 * (t + a4)));
}

describe('water density table', () => {
  it('has a row for each whole degree from 0 to 40 °C', () => {
    expect(WATER_DENSITY_KG_M3).toHaveLength(41);
  });

  it("matches the CRC Handbook's Kell values quoted in REFERENCES.md", () => {
    // Kell's table as reproduced in the CRC Handbook (REFERENCES.md): 999.972 kg/m³ at 4 °C.
    expect(waterDensityGPerCm3(4) * 1000).toBeCloseTo(999.972, 3);
    // Same source: 998.207 at 20 °C and 997.048 at 25 °C. Ours is the ITS-90 form of Kell's
    // equation, 0.004 kg/m³ lower at these temperatures (4 ppm): checked to 0.005 kg/m³.
    expect(Math.abs(waterDensityGPerCm3(20) * 1000 - 998.207)).toBeLessThan(0.005);
    expect(Math.abs(waterDensityGPerCm3(25) * 1000 - 997.048)).toBeLessThan(0.005);
    // REFERENCES.md gives 997.770 at 22 °C from memory; Kell's ITS-90 form gives 997.769.
    expect(Math.abs(waterDensityGPerCm3(22) * 1000 - 997.77)).toBeLessThan(0.005);
  });

  it('agrees with the CIPM formula (Tanaka et al. 2001) within 0.005 kg/m³ at every row', () => {
    WATER_DENSITY_KG_M3.forEach((rho, t) => {
      expect(Math.abs(rho - tanakaKgM3(t))).toBeLessThan(0.005);
    });
  });

  it('is densest near 4 °C and gets lighter towards 40 °C', () => {
    const densest = WATER_DENSITY_KG_M3.indexOf(Math.max(...WATER_DENSITY_KG_M3));
    expect(densest).toBe(4);
    for (let t = 5; t <= 40; t++) {
      expect(WATER_DENSITY_KG_M3[t]!).toBeLessThan(WATER_DENSITY_KG_M3[t - 1]!);
    }
  });

  it('interpolates between whole degrees close to the CIPM curve', () => {
    for (const t of [0.5, 12.3, 21.5, 22.7, 39.9]) {
      expect(Math.abs(waterDensityGPerCm3(t) * 1000 - tanakaKgM3(t))).toBeLessThan(0.006);
    }
  });

  it('refuses temperatures outside the table, naming the field', () => {
    for (const t of [-0.1, 40.1, 90, Number.NaN]) {
      expect(() => waterDensityGPerCm3(t)).toThrow(MixInputError);
    }
    try {
      waterDensityGPerCm3(41);
      expect.unreachable();
    } catch (err) {
      expect((err as MixInputError).field).toBe('cavity.waterTempC');
      expect((err as Error).message).toMatch(/between 0 and 40 °C/);
    }
  });
});

describe('water fill', () => {
  it('turns 850 g of water at 22 °C into the cavity volume', () => {
    // 850 g / 0.997769 g/cm³ (Kell, ITS-90 form, 22 °C) = 851.90 cm³: 1.9 cm³ more than 850.
    const v = waterFillVolumeCm3(850, 22);
    expect(v).toBeCloseTo(850 / 0.997769, 6);
    expect(v).toBeGreaterThan(851.8);
    expect(cavityVolumeCm3({ shape: 'water', waterMassG: 850, waterTempC: 22 })).toBe(v);
  });

  it('refuses no water', () => {
    expect(() => waterFillVolumeCm3(0, 20)).toThrow('The mass of water must be more than zero');
  });
});
