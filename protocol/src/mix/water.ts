import { MixInputError, requirePositive } from './errors.js';

/**
 * Density of air-free pure water at 101.325 kPa, kg/m³, at each whole degree Celsius from 0 to
 * 40 °C (ITS-90).
 *
 * Source: Kell's equation (G. S. Kell, J. Chem. Eng. Data 20 (1975) 97), the equation behind the
 * water density table reproduced in the CRC Handbook of Chemistry and Physics, in the ITS-90 form
 * of Bettin and Spieweck (PTB-Mitteilungen 100 (1990) 195):
 *
 *   ρ = (999.83952 + 16.952577 t − 7.9905127e-3 t² − 46.241757e-6 t³ + 105.84601e-9 t⁴
 *        − 281.03006e-12 t⁵) / (1 + 16.887236e-3 t)
 *
 * From memory: every value below. They were computed from the coefficients above, which we
 * recalled from memory and then matched against the equation as printed in IP Standard Methods
 * (1998), Appendix G; no printed copy of the table itself was at hand, so the rows were not copied
 * from it. The rows agree with REFERENCES.md's CRC anchors (999.972 at 4 °C, 998.207 at 20 °C,
 * 997.048 at 25 °C) within 0.005 kg/m³ (5 ppm, the difference between the IPTS-68 and ITS-90
 * forms), and with the CIPM formula (Tanaka et al., Metrologia 38 (2001) 301) within 0.005 kg/m³;
 * the tests check both.
 */
export const WATER_DENSITY_KG_M3: readonly number[] = [
  999.84,
  999.899,
  999.94,
  999.964,
  999.972,
  999.964,
  999.94,
  999.901,
  999.848,
  999.781, // 0–9 °C
  999.699,
  999.605,
  999.497,
  999.377,
  999.244,
  999.099,
  998.942,
  998.774,
  998.595,
  998.404, // 10–19
  998.203,
  997.991,
  997.769,
  997.537,
  997.295,
  997.043,
  996.782,
  996.511,
  996.232,
  995.943, // 20–29
  995.645,
  995.339,
  995.024,
  994.7,
  994.369,
  994.029,
  993.681,
  993.325,
  992.962,
  992.591, // 30–39
  992.212, // 40 °C
];

export const WATER_TABLE_MIN_C = 0;
export const WATER_TABLE_MAX_C = WATER_DENSITY_KG_M3.length - 1;

/**
 * Density of water in g/cm³ at `tempC`, interpolated linearly between whole degrees (the curve is
 * smooth enough that the error is below 0.000 01 g/cm³).
 */
export function waterDensityGPerCm3(tempC: number, field = 'cavity.waterTempC'): number {
  if (typeof tempC !== 'number' || !Number.isFinite(tempC)) {
    throw new MixInputError(field, 'The water temperature must be a number');
  }
  if (tempC < WATER_TABLE_MIN_C || tempC > WATER_TABLE_MAX_C) {
    throw new MixInputError(
      field,
      `The water temperature must be between ${WATER_TABLE_MIN_C} and ${WATER_TABLE_MAX_C} °C; the density table covers only that range`,
    );
  }
  const lower = Math.floor(tempC);
  const upper = Math.min(lower + 1, WATER_TABLE_MAX_C);
  const f = tempC - lower;
  const kgM3 = WATER_DENSITY_KG_M3[lower]! * (1 - f) + WATER_DENSITY_KG_M3[upper]! * f;
  return kgM3 / 1000;
}

/**
 * Volume in cm³ of a cavity that a weighed mass of water fills at a temperature. The scale's
 * reading in air is used as the mass: the air-buoyancy correction (about 0.1 % for water) is
 * much smaller than any overage allowance.
 */
export function waterFillVolumeCm3(waterMassG: number, waterTempC: number): number {
  requirePositive(waterMassG, 'cavity.waterMassG', 'mass of water');
  return waterMassG / waterDensityGPerCm3(waterTempC);
}
