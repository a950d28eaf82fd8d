import { z } from 'zod';
import { GRAMS_PER_UNIT } from '../scale/types.js';
import { MixInputError } from './errors.js';

/*
 * Units with exact definitions. Every quantity carries its unit; conversions go through one base
 * unit per dimension (cm, cm³, g) with factors that are exact by definition, and nothing is
 * rounded here: rounding is for display only.
 */

export const LENGTH_UNITS = ['in', 'mm', 'cm'] as const;
export type LengthUnit = (typeof LENGTH_UNITS)[number];

export const VOLUME_UNITS = ['in3', 'cm3', 'mL', 'L', 'gal', 'floz'] as const;
export type VolumeUnit = (typeof VOLUME_UNITS)[number];

export const MASS_UNITS = ['g', 'kg', 'lb', 'oz'] as const;
export type MassUnit = (typeof MASS_UNITS)[number];

export interface Quantity<U extends string> {
  value: number;
  unit: U;
}
export type Length = Quantity<LengthUnit>;
export type Volume = Quantity<VolumeUnit>;
export type Mass = Quantity<MassUnit>;

/** 1 in = 2.54 cm exactly (international yard and pound agreement, 1959: 1 yd = 0.9144 m). */
export const CM_PER_INCH = 2.54;
/** 16.387 064 cm³, exact: 2.54³. */
export const CM3_PER_IN3 = CM_PER_INCH ** 3;
/** 1 US gallon = 231 in³ exactly (NIST Handbook 44, Appendix C). */
export const IN3_PER_US_GALLON = 231;
/** 1 lb = 453.592 37 g exactly (1959 agreement). */
export const GRAMS_PER_POUND = GRAMS_PER_UNIT.lb;

export const CM_PER_LENGTH_UNIT: Readonly<Record<LengthUnit, number>> = {
  in: CM_PER_INCH,
  mm: 0.1,
  cm: 1,
};

export const CM3_PER_VOLUME_UNIT: Readonly<Record<VolumeUnit, number>> = {
  in3: CM3_PER_IN3,
  cm3: 1,
  // The litre is exactly 1 dm³ (12th CGPM, 1964), so 1 mL = 1 cm³.
  mL: 1,
  L: 1000,
  gal: IN3_PER_US_GALLON * CM3_PER_IN3,
  // 1 US fluid ounce = 1/128 US gallon.
  floz: (IN3_PER_US_GALLON * CM3_PER_IN3) / 128,
};

export const GRAMS_PER_MASS_UNIT: Readonly<Record<MassUnit, number>> = GRAMS_PER_UNIT;

const UNIT_WORDS: Record<string, string> = {
  in: 'in',
  mm: 'mm',
  cm: 'cm',
  in3: 'in³',
  cm3: 'cm³',
  mL: 'mL',
  L: 'L',
  gal: 'US gal',
  floz: 'US fl oz',
  g: 'g',
  kg: 'kg',
  lb: 'lb',
  oz: 'oz',
};

/** How a unit is written for people (`in3` → `in³`). */
export function unitLabel(unit: string): string {
  return UNIT_WORDS[unit] ?? unit;
}

function factor<U extends string>(
  table: Readonly<Record<U, number>>,
  unit: string,
  field: string,
  kind: string,
): number {
  const f = Object.hasOwn(table, unit) ? table[unit as U] : undefined;
  if (f === undefined) {
    const known = Object.keys(table).join(', ');
    throw new MixInputError(field, `"${unit}" is not a ${kind} unit we know; use one of ${known}`);
  }
  return f;
}

function finite(value: number, field: string): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new MixInputError(field, 'The value must be a number');
  }
  return value;
}

export function lengthCm(length: Length, field = 'unit'): number {
  return finite(length.value, field) * factor(CM_PER_LENGTH_UNIT, length.unit, field, 'length');
}

export function volumeCm3(volume: Volume, field = 'unit'): number {
  return finite(volume.value, field) * factor(CM3_PER_VOLUME_UNIT, volume.unit, field, 'volume');
}

export function massG(mass: Mass, field = 'unit'): number {
  return finite(mass.value, field) * factor(GRAMS_PER_MASS_UNIT, mass.unit, field, 'mass');
}

export function convertLength(length: Length, to: LengthUnit): Length {
  return { value: lengthCm(length) / factor(CM_PER_LENGTH_UNIT, to, 'unit', 'length'), unit: to };
}

export function convertVolume(volume: Volume, to: VolumeUnit): Volume {
  return {
    value: volumeCm3(volume) / factor(CM3_PER_VOLUME_UNIT, to, 'unit', 'volume'),
    unit: to,
  };
}

export function convertMass(mass: Mass, to: MassUnit): Mass {
  return { value: massG(mass) / factor(GRAMS_PER_MASS_UNIT, to, 'unit', 'mass'), unit: to };
}

const unitError = (kind: string, units: readonly string[]) => () =>
  `Choose a ${kind} unit: ${units.map(unitLabel).join(', ')}`;

export const lengthUnitSchema = z.enum(LENGTH_UNITS, { error: unitError('length', LENGTH_UNITS) });
export const volumeUnitSchema = z.enum(VOLUME_UNITS, { error: unitError('volume', VOLUME_UNITS) });
export const massUnitSchema = z.enum(MASS_UNITS, { error: unitError('mass', MASS_UNITS) });
