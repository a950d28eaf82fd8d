import { z } from 'zod';
import {
  cavitySchema,
  cavityVolumeCm3,
  fillVolumeCm3,
  measure,
  netVolumeCm3,
  positiveMeasure,
} from './cavity.js';
import { MixInputError, requirePositive } from './errors.js';
import {
  IN3_PER_LB_AT_SG1,
  massFromVolumeG,
  mixSpecificGravity,
  specificGravityFromYield,
} from './material.js';
import { mixRatioSchema, PART_NAMES, splitTotalG, weightRatio } from './ratio.js';
import { minNetWeightG } from './scale-fitness.js';
import { DEFAULT_TOLERANCE_PCT, toleranceBand } from './targets.js';
import { CM3_PER_IN3, volumeCm3, volumeUnitSchema } from './units.js';

/** What a material brings to a plan: its ratio and how dense it is. */
export const planMaterialSchema = z
  .object(
    {
      ratio: mixRatioSchema,
      /** SG of the mixed material (water = 1). */
      specificGravity: positiveMeasure('specific gravity').optional(),
      /** Volumetric yield of the mixed material, in³/lb. */
      yieldIn3PerLb: positiveMeasure('yield').optional(),
      /** SG of each part, part A first: needed for a ratio by volume. */
      partSpecificGravities: z
        .array(positiveMeasure('specific gravity of the part'))
        .min(2, { error: 'Give one specific gravity for each part' })
        .max(3, { error: 'Give one specific gravity for each part' })
        .optional(),
    },
    { error: () => "Enter the material's mix ratio and specific gravity" },
  )
  .superRefine((m, ctx) => {
    if (m.specificGravity !== undefined && m.yieldIn3PerLb !== undefined) {
      ctx.addIssue({
        code: 'custom',
        path: ['yieldIn3PerLb'],
        message: 'Give the specific gravity or the yield, not both',
      });
    }
    if (
      m.specificGravity === undefined &&
      m.yieldIn3PerLb === undefined &&
      m.partSpecificGravities === undefined
    ) {
      ctx.addIssue({
        code: 'custom',
        path: ['specificGravity'],
        message: "Enter the material's specific gravity or its yield",
      });
    }
    if (m.ratio?.basis === 'volume' && m.partSpecificGravities === undefined) {
      ctx.addIssue({
        code: 'custom',
        path: ['partSpecificGravities'],
        message: "A ratio by volume needs each part's specific gravity",
      });
    }
    if (
      m.partSpecificGravities !== undefined &&
      m.ratio?.parts !== undefined &&
      m.partSpecificGravities.length !== m.ratio.parts.length
    ) {
      ctx.addIssue({
        code: 'custom',
        path: ['partSpecificGravities'],
        message: `Give one specific gravity for each of the ${m.ratio.parts.length} parts`,
      });
    }
  });
export type PlanMaterial = z.infer<typeof planMaterialSchema>;

/** The bench scale, to check that it can weigh the smallest part within the band. */
export const planScaleSchema = z.object({
  /** Readability d (the scale interval), g. */
  readabilityG: positiveMeasure('readability'),
  /** Repeatability s, g. Unknown: the floor of 0.41 d applies. */
  repeatabilityG: measure('repeatability')
    .nonnegative({ error: 'The repeatability cannot be negative' })
    .optional(),
  /** Most the scale weighs, g. */
  capacityG: positiveMeasure('capacity').optional(),
  /** Mass of the empty mixing cup, g, which the scale carries too. */
  cupMassG: measure('cup mass')
    .nonnegative({ error: 'The cup mass cannot be negative' })
    .optional(),
});

/** The plan request's fields, before the checks that need the arithmetic. */
export const planRequestObject = z.object(
  {
    cavity: cavitySchema,
    /** Volume of the model, which the material does not fill. */
    displacement: z
      .object({ volume: positiveMeasure('model volume'), unit: volumeUnitSchema })
      .optional(),
    overagePct: measure('overage')
      .nonnegative({ error: 'The overage cannot be negative' })
      .max(200, { error: 'An overage above 200 % is surely a typing mistake' })
      .default(0),
    /** Grams left on the walls of the first cup in the double-cup transfer. */
    cupLossG: measure('cup loss')
      .nonnegative({ error: 'The cup loss cannot be negative' })
      .default(0),
    material: planMaterialSchema,
    tolerancePct: positiveMeasure('tolerance')
      .max(50, { error: 'The tolerance must be 50 % or less' })
      .default(DEFAULT_TOLERANCE_PCT),
    scale: planScaleSchema.optional(),
  },
  { error: () => 'Send the plan request as a JSON object' },
);

/** Body of `POST /api/plan`: a cavity and a material in, a pour plan out. */
export const planRequestSchema = planRequestObject.superRefine(
  (req, ctx) => {
    // Checks that need the arithmetic (a model larger than the cavity) come from the math itself,
    // so the form and the hub name the same field with the same words.
    try {
      computePlan(req);
    } catch (err) {
      if (!(err instanceof MixInputError)) throw err;
      ctx.addIssue({ code: 'custom', path: err.field.split('.'), message: err.message });
    }
  },
  { when: (payload) => payload.issues.length === 0 },
);
export type PlanRequest = z.output<typeof planRequestObject>;
export type PlanRequestInput = z.input<typeof planRequestObject>;

export const planWarningSchema = z.object({
  code: z.enum(['SCALE_TOO_COARSE', 'OVER_CAPACITY', 'PART_VOLUMES_FROM_MIX_SG']),
  message: z.string(),
});
export type PlanWarning = z.infer<typeof planWarningSchema>;

export const planPartSchema = z.object({
  name: z.enum(PART_NAMES),
  /** Parts by weight of this part, from the ratio. */
  weightPart: z.number(),
  massG: z.number(),
  volumeCm3: z.number(),
  /** The ± tolerance band around this part's planned mass. */
  lowG: z.number(),
  highG: z.number(),
});

/** Every step of the arithmetic, unrounded, so a lead can check it by hand. */
export const planResponseSchema = z.object({
  cavityVolumeCm3: z.number(),
  cavityVolumeIn3: z.number(),
  displacementCm3: z.number(),
  netVolumeCm3: z.number(),
  netVolumeIn3: z.number(),
  overagePct: z.number(),
  fillVolumeCm3: z.number(),
  fillVolumeIn3: z.number(),
  /** SG of the mix used to turn volume into mass. */
  specificGravity: z.number(),
  yieldIn3PerLb: z.number(),
  fillMassG: z.number(),
  cupLossG: z.number(),
  totalMassG: z.number(),
  weightRatio: z.array(z.number()),
  tolerancePct: z.number(),
  parts: z.array(planPartSchema),
  minNetWeightG: z.number().optional(),
  warnings: z.array(planWarningSchema),
});
export type PlanResponse = z.infer<typeof planResponseSchema>;
export type PlanPart = z.infer<typeof planPartSchema>;

const grams = (g: number) => `${g.toFixed(g < 10 ? 2 : 1)} g`;

function densityOf(material: PlanMaterial): number {
  if (material.specificGravity !== undefined && material.yieldIn3PerLb !== undefined) {
    throw new MixInputError(
      'material.yieldIn3PerLb',
      'Give the specific gravity or the yield, not both',
    );
  }
  if (material.specificGravity !== undefined) return material.specificGravity;
  if (material.yieldIn3PerLb !== undefined) return specificGravityFromYield(material.yieldIn3PerLb);
  if (material.partSpecificGravities !== undefined) {
    return mixSpecificGravity(material.ratio, material.partSpecificGravities);
  }
  throw new MixInputError(
    'material.specificGravity',
    "Enter the material's specific gravity or its yield",
  );
}

/**
 * The pour plan: cavity − model = net; net × (1 + overage) = fill; fill × SG = mass; + cup loss =
 * total; total split by the ratio by weight. Pure; throws {@link MixInputError} naming the field.
 */
export function computePlan(req: PlanRequest): PlanResponse {
  const cavityCm3 = cavityVolumeCm3(req.cavity);
  const displacementCm3 = req.displacement
    ? volumeCm3(
        {
          value: requirePositive(req.displacement.volume, 'displacement.volume', 'model volume'),
          unit: req.displacement.unit,
        },
        'displacement.unit',
      )
    : 0;
  const netCm3 = netVolumeCm3(cavityCm3, displacementCm3);
  const overagePct = req.overagePct ?? 0;
  const fillCm3 = fillVolumeCm3(netCm3, overagePct);
  const sg = densityOf(req.material);
  const fillMassG = massFromVolumeG(fillCm3, { specificGravity: sg });
  const cupLossG = req.cupLossG ?? 0;
  if (!Number.isFinite(cupLossG) || cupLossG < 0) {
    throw new MixInputError('cupLossG', 'The cup loss cannot be negative');
  }
  const totalMassG = fillMassG + cupLossG;
  if (!Number.isFinite(totalMassG)) {
    throw new MixInputError(
      'cavity',
      'The plan is too large to compute: check the sizes and their units',
    );
  }
  const weights = weightRatio(req.material.ratio, req.material.partSpecificGravities);
  const partSgs = req.material.partSpecificGravities;
  const tolerancePct = req.tolerancePct ?? DEFAULT_TOLERANCE_PCT;
  const parts = splitTotalG(totalMassG, weights).map((massG, i) => {
    const band = toleranceBand(massG, tolerancePct);
    return {
      name: PART_NAMES[i]!,
      weightPart: weights[i]!,
      massG,
      volumeCm3: massG / (partSgs?.[i] ?? sg),
      lowG: band.lowG,
      highG: band.highG,
    };
  });

  const warnings: PlanWarning[] = [];
  if (partSgs === undefined) {
    warnings.push({
      code: 'PART_VOLUMES_FROM_MIX_SG',
      message:
        "Part volumes assume every part has the mix's specific gravity; give each part's SG for exact volumes",
    });
  }
  let minNetG: number | undefined;
  if (req.scale) {
    minNetG = minNetWeightG(
      { readabilityG: req.scale.readabilityG, repeatabilityG: req.scale.repeatabilityG ?? 0 },
      tolerancePct,
    );
    const smallest = parts.reduce((a, b) => (b.massG < a.massG ? b : a));
    if (smallest.massG < minNetG) {
      warnings.push({
        code: 'SCALE_TOO_COARSE',
        message: `Part ${smallest.name} (${grams(smallest.massG)}) is below the smallest mass this scale weighs within ±${tolerancePct} % (${grams(minNetG)}): use a finer scale or mix a larger batch`,
      });
    }
    const onScaleG = totalMassG + (req.scale.cupMassG ?? 0);
    if (req.scale.capacityG !== undefined && onScaleG > req.scale.capacityG) {
      warnings.push({
        code: 'OVER_CAPACITY',
        message: `${req.scale.cupMassG ? 'The mix and its cup weigh' : 'The mix weighs'} ${grams(onScaleG)}, more than the scale's capacity (${grams(req.scale.capacityG)}): split the pour into batches or use a larger scale`,
      });
    }
  }

  return {
    cavityVolumeCm3: cavityCm3,
    cavityVolumeIn3: cavityCm3 / CM3_PER_IN3,
    displacementCm3,
    netVolumeCm3: netCm3,
    netVolumeIn3: netCm3 / CM3_PER_IN3,
    overagePct,
    fillVolumeCm3: fillCm3,
    fillVolumeIn3: fillCm3 / CM3_PER_IN3,
    specificGravity: sg,
    yieldIn3PerLb: IN3_PER_LB_AT_SG1 / sg,
    fillMassG,
    cupLossG,
    totalMassG,
    weightRatio: weights,
    tolerancePct,
    parts,
    ...(minNetG !== undefined ? { minNetWeightG: minNetG } : {}),
    warnings,
  };
}
