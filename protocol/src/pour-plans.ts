import { z } from 'zod';
import { batchStateSchema, batchVerdictSchema } from './batches.js';
import { materialIdSchema, type Material } from './materials.js';
import { MixInputError } from './mix/errors.js';
import { mixSpecificGravity, specificGravityFromYield } from './mix/material.js';
import { splitTotalG, weightRatio } from './mix/ratio.js';
import {
  computePlan,
  planRequestObject,
  type PlanMaterial,
  type PlanResponse,
} from './mix/plan.js';
import { recordIdSchema, text } from './text.js';

/** Path parameter of `/api/pour-plans/:id`, and the plan a batch is started from. */
export const pourPlanIdSchema = recordIdSchema('pour plan', 'Choose a pour plan');

/**
 * The volume estimator's input as the lead entered it: the cavity, the model it displaces, the
 * overage and the cup loss. The material is the plan's own, so its density is not repeated here.
 */
export const pourEstimateSchema = planRequestObject.pick({
  cavity: true,
  displacement: true,
  overagePct: true,
  cupLossG: true,
});
export type PourEstimate = z.output<typeof pourEstimateSchema>;
export type PourEstimateInput = z.input<typeof pourEstimateSchema>;

const planName = text({ error: 'Name the mold or part' })
  .trim()
  .min(1, { error: 'Name the mold or part' })
  .max(120, { error: 'Keep the name under 120 characters' });
const moldRef = text().trim().max(80, { error: 'Keep the mold reference under 80 characters' });

/** Body of `POST /api/pour-plans`: a saved volume-estimator result for one mold or part. */
export const pourPlanInputSchema = z.object(
  {
    name: planName,
    /** The shop's number or mark on the mold, if it has one. */
    moldRef: moldRef.optional(),
    materialId: materialIdSchema,
    estimate: pourEstimateSchema,
  },
  { error: () => 'Send the pour plan as a JSON object' },
);
export type PourPlanInput = z.input<typeof pourPlanInputSchema>;

/** Body of `PATCH /api/pour-plans/:id`: the fields to change; an empty mold reference clears it. */
export const pourPlanPatchSchema = z
  .object(
    {
      name: planName.optional(),
      moldRef: moldRef.optional(),
      materialId: materialIdSchema.optional(),
      estimate: pourEstimateSchema.optional(),
    },
    { error: () => 'Send the changes as a JSON object' },
  )
  .refine((p) => Object.values(p).some((v) => v !== undefined), {
    error: 'Change at least one field',
  });
export type PourPlanPatch = z.input<typeof pourPlanPatchSchema>;

/** A batch poured from a plan, as its page lists them. */
export const pourPlanBatchSchema = z.object({
  id: z.number().int(),
  state: batchStateSchema,
  verdict: batchVerdictSchema.nullable(),
  totalMassG: z.number(),
  operatorName: z.string(),
  createdAt: z.string(),
});
export type PourPlanBatch = z.infer<typeof pourPlanBatchSchema>;

export const pourPlanSchema = z.object({
  id: z.string(),
  name: z.string(),
  moldRef: z.string().nullable(),
  materialId: z.string(),
  materialName: z.string(),
  estimate: pourEstimateSchema,
  /** The total as computed when the plan was saved (or last edited), g. */
  savedTotalMassG: z.number(),
  /** The total with the material as it is now, g: what a batch from this plan weighs. */
  totalMassG: z.number(),
  /** The material's ratio or density changed since the plan was saved, so the total moved. */
  materialChanged: z.boolean(),
  createdBy: z.object({ id: z.string(), name: z.string() }),
  createdAt: z.string(),
  updatedAt: z.string(),
  /** Batches poured from the plan, newest first. Only on the single-plan answer. */
  batches: z.array(pourPlanBatchSchema).optional(),
});
export type PourPlan = z.infer<typeof pourPlanSchema>;

/** What a material brings to the volume estimator: its ratio and density, nothing else. */
export function planMaterialOf(
  m: Pick<Material, 'ratio' | 'specificGravity' | 'yieldIn3PerLb' | 'partSpecificGravities'>,
): PlanMaterial {
  return {
    ratio: { basis: m.ratio.basis, parts: m.ratio.parts },
    ...(m.specificGravity !== undefined && { specificGravity: m.specificGravity }),
    ...(m.yieldIn3PerLb !== undefined && { yieldIn3PerLb: m.yieldIn3PerLb }),
    ...(m.partSpecificGravities !== undefined && {
      partSpecificGravities: m.partSpecificGravities,
    }),
  };
}

/**
 * The plan a saved estimate makes with a material as it is now. Throws {@link MixInputError}
 * naming the field (prefixed `estimate.`) when the estimate does not work with this material.
 */
export function pourPlanResult(
  estimate: PourEstimate,
  material: Parameters<typeof planMaterialOf>[0] & Pick<Material, 'tolerancePct'>,
): PlanResponse {
  try {
    return computePlan({
      ...estimate,
      material: planMaterialOf(material),
      tolerancePct: material.tolerancePct,
    });
  } catch (err) {
    if (err instanceof MixInputError && !err.field.startsWith('material')) {
      throw new MixInputError(`estimate.${err.field}`, err.message);
    }
    throw err;
  }
}

/**
 * Each part's mass and volume in a total mass of the material: the split by weight, and each
 * part's volume from its own SG (the mix's when the parts' are not known).
 */
export function partsOfTotal(
  totalMassG: number,
  material: Parameters<typeof planMaterialOf>[0],
): { massG: number; volumeCm3: number }[] {
  const m = planMaterialOf(material);
  const partSgs = m.partSpecificGravities;
  const sg =
    m.specificGravity ??
    (m.yieldIn3PerLb !== undefined
      ? specificGravityFromYield(m.yieldIn3PerLb)
      : mixSpecificGravity(m.ratio, partSgs ?? []));
  return splitTotalG(totalMassG, weightRatio(m.ratio, partSgs)).map((massG, i) => ({
    massG,
    volumeCm3: massG / (partSgs?.[i] ?? sg),
  }));
}
