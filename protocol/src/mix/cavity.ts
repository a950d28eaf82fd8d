import { z } from 'zod';
import { MixInputError, requirePositive } from './errors.js';
import {
  lengthCm,
  lengthUnitSchema,
  volumeCm3,
  volumeUnitSchema,
  type LengthUnit,
  type VolumeUnit,
} from './units.js';
import { waterFillVolumeCm3, WATER_TABLE_MAX_C, WATER_TABLE_MIN_C } from './water.js';

/** A number the operator must type: says which field is missing or not a number. */
export function measure(label: string) {
  return z.number({
    error: (issue) =>
      issue.input === undefined || issue.input === null
        ? `Enter the ${label}`
        : `The ${label} must be a number`,
  });
}

/** A size, mass or ratio part: a number above zero. */
export function positiveMeasure(label: string) {
  return measure(label).positive({ error: `The ${label} must be more than zero` });
}

export const boxCavitySchema = z.object({
  shape: z.literal('box'),
  length: positiveMeasure('length'),
  width: positiveMeasure('width'),
  height: positiveMeasure('height'),
  unit: lengthUnitSchema,
});

export const cylinderCavitySchema = z
  .object({
    shape: z.literal('cylinder'),
    diameter: positiveMeasure('diameter').optional(),
    radius: positiveMeasure('radius').optional(),
    height: positiveMeasure('height'),
    unit: lengthUnitSchema,
  })
  .superRefine((c, ctx) => {
    if (c.diameter === undefined && c.radius === undefined) {
      ctx.addIssue({ code: 'custom', path: ['diameter'], message: 'Enter the diameter' });
    } else if (c.diameter !== undefined && c.radius !== undefined) {
      ctx.addIssue({
        code: 'custom',
        path: ['radius'],
        message: 'Give the diameter or the radius, not both',
      });
    }
  });

export const frustumCavitySchema = z.object({
  shape: z.literal('frustum'),
  topDiameter: positiveMeasure('top diameter'),
  bottomDiameter: positiveMeasure('bottom diameter'),
  height: positiveMeasure('height'),
  unit: lengthUnitSchema,
});

export const knownVolumeCavitySchema = z.object({
  shape: z.literal('volume'),
  volume: positiveMeasure('volume'),
  unit: volumeUnitSchema,
});

export const waterCavitySchema = z.object({
  shape: z.literal('water'),
  waterMassG: positiveMeasure('mass of water'),
  waterTempC: measure('water temperature')
    .min(WATER_TABLE_MIN_C, {
      error: `The water temperature must be between ${WATER_TABLE_MIN_C} and ${WATER_TABLE_MAX_C} °C`,
    })
    .max(WATER_TABLE_MAX_C, {
      error: `The water temperature must be between ${WATER_TABLE_MIN_C} and ${WATER_TABLE_MAX_C} °C`,
    }),
});

export const CAVITY_SHAPES = ['box', 'cylinder', 'frustum', 'volume', 'water'] as const;
export type CavityShape = (typeof CAVITY_SHAPES)[number];

export const cavitySchema = z.discriminatedUnion(
  'shape',
  [
    boxCavitySchema,
    cylinderCavitySchema,
    frustumCavitySchema,
    knownVolumeCavitySchema,
    waterCavitySchema,
  ],
  { error: () => `Choose a cavity shape: ${CAVITY_SHAPES.join(', ')}` },
);
export type Cavity = z.infer<typeof cavitySchema>;

/** Box: length × width × height, in cm³. */
export function boxVolumeCm3(length: number, width: number, height: number, unit: LengthUnit) {
  const l = lengthCm(
    { value: requirePositive(length, 'cavity.length', 'length'), unit },
    'cavity.unit',
  );
  const w = lengthCm(
    { value: requirePositive(width, 'cavity.width', 'width'), unit },
    'cavity.unit',
  );
  const h = lengthCm(
    { value: requirePositive(height, 'cavity.height', 'height'), unit },
    'cavity.unit',
  );
  return l * w * h;
}

/** Right circular cylinder: π r² h, in cm³. */
export function cylinderVolumeCm3(
  size: { radius: number } | { diameter: number },
  height: number,
  unit: LengthUnit,
) {
  const r =
    'radius' in size
      ? lengthCm(
          { value: requirePositive(size.radius, 'cavity.radius', 'radius'), unit },
          'cavity.unit',
        )
      : lengthCm(
          { value: requirePositive(size.diameter, 'cavity.diameter', 'diameter'), unit },
          'cavity.unit',
        ) / 2;
  const h = lengthCm(
    { value: requirePositive(height, 'cavity.height', 'height'), unit },
    'cavity.unit',
  );
  return Math.PI * r * r * h;
}

/**
 * Conical frustum (a tapered round): π h (R² + R r + r²) / 3, in cm³ — the solid-mensuration
 * formula. Either end may be the wider one.
 */
export function frustumVolumeCm3(
  topDiameter: number,
  bottomDiameter: number,
  height: number,
  unit: LengthUnit,
) {
  const R =
    lengthCm(
      { value: requirePositive(topDiameter, 'cavity.topDiameter', 'top diameter'), unit },
      'cavity.unit',
    ) / 2;
  const r =
    lengthCm(
      { value: requirePositive(bottomDiameter, 'cavity.bottomDiameter', 'bottom diameter'), unit },
      'cavity.unit',
    ) / 2;
  const h = lengthCm(
    { value: requirePositive(height, 'cavity.height', 'height'), unit },
    'cavity.unit',
  );
  return (Math.PI * h * (R * R + R * r + r * r)) / 3;
}

/** A known volume (from CAD, say), in cm³. */
export function knownVolumeCm3(volume: number, unit: VolumeUnit) {
  return volumeCm3(
    { value: requirePositive(volume, 'cavity.volume', 'volume'), unit },
    'cavity.unit',
  );
}

/** Volume of any cavity, in cm³. Throws {@link MixInputError} naming the bad field. */
export function cavityVolumeCm3(cavity: Cavity): number {
  switch (cavity.shape) {
    case 'box':
      return boxVolumeCm3(cavity.length, cavity.width, cavity.height, cavity.unit);
    case 'cylinder':
      if (cavity.radius !== undefined && cavity.diameter !== undefined) {
        throw new MixInputError('cavity.radius', 'Give the diameter or the radius, not both');
      }
      if (cavity.radius !== undefined) {
        return cylinderVolumeCm3({ radius: cavity.radius }, cavity.height, cavity.unit);
      }
      if (cavity.diameter === undefined) {
        throw new MixInputError('cavity.diameter', 'Enter the diameter');
      }
      return cylinderVolumeCm3({ diameter: cavity.diameter }, cavity.height, cavity.unit);
    case 'frustum':
      return frustumVolumeCm3(
        cavity.topDiameter,
        cavity.bottomDiameter,
        cavity.height,
        cavity.unit,
      );
    case 'volume':
      return knownVolumeCm3(cavity.volume, cavity.unit);
    case 'water':
      return waterFillVolumeCm3(cavity.waterMassG, cavity.waterTempC);
    default:
      throw new MixInputError('cavity.shape', `Choose a cavity shape: ${CAVITY_SHAPES.join(', ')}`);
  }
}

/**
 * Net volume = cavity − displaced volume of the model. A model as large as the cavity or larger
 * leaves nothing to fill, which is always a measuring mistake.
 */
export function netVolumeCm3(cavityCm3: number, displacedCm3 = 0): number {
  requirePositive(cavityCm3, 'cavity', 'cavity volume');
  if (!Number.isFinite(displacedCm3) || displacedCm3 < 0) {
    throw new MixInputError('displacement.volume', 'The model volume cannot be negative');
  }
  if (displacedCm3 >= cavityCm3) {
    throw new MixInputError(
      'displacement.volume',
      'The model takes up as much room as the cavity or more: check both measurements',
    );
  }
  return cavityCm3 - displacedCm3;
}

/** Fill volume = net volume × (1 + overage %). The overage applies to the net volume. */
export function fillVolumeCm3(netCm3: number, overagePct = 0): number {
  requirePositive(netCm3, 'cavity', 'net volume');
  if (!Number.isFinite(overagePct) || overagePct < 0) {
    throw new MixInputError('overagePct', 'The overage cannot be negative');
  }
  return netCm3 * (1 + overagePct / 100);
}
