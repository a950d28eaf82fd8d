import { zodResolver } from '@hookform/resolvers/zod';
import {
  LENGTH_UNITS,
  planRequestSchema,
  unitLabel,
  VOLUME_UNITS,
  type PlanMaterial,
  type PlanRequestInput,
  type PlanResponse,
} from '@tareline/protocol';
import { useEffect, useMemo, useState } from 'react';
import {
  useForm,
  useWatch,
  type FieldErrors,
  type Resolver,
  type UseFormRegister,
} from 'react-hook-form';
import { usePlanPreview } from '../hooks/use-plan-preview';
import { formatMass } from '../utils/format';
import {
  CheckField,
  FieldGroup,
  NumberField,
  SelectField,
} from '../../../components/form/plan-fields';
import { PlanSteps } from './plan-steps';

type Shape = 'box' | 'cylinder' | 'frustum' | 'volume' | 'water';
type DensityMode = 'sg' | 'yield' | 'parts';

const SHAPES: readonly { value: Shape; label: string }[] = [
  { value: 'box', label: 'Box' },
  { value: 'cylinder', label: 'Round (cylinder)' },
  { value: 'frustum', label: 'Tapered round' },
  { value: 'volume', label: 'Known volume (from CAD)' },
  { value: 'water', label: 'Water fill, weighed' },
];
const LENGTH_OPTIONS = LENGTH_UNITS.map((u) => ({ value: u, label: unitLabel(u) }));
const VOLUME_OPTIONS = VOLUME_UNITS.map((u) => ({ value: u, label: unitLabel(u) }));
const PART_NAMES = ['A', 'B', 'C'] as const;

/** What a typed box holds: '' is nothing yet, anything else is read as a number ("1,5" too). */
function asNumber(raw: unknown): number | undefined {
  if (typeof raw === 'number') return raw;
  if (raw === undefined || raw === null) return undefined;
  const text = String(raw).trim();
  if (text === '') return undefined;
  return Number(text.replace(',', '.'));
}
const num = { setValueAs: asNumber };

/** Reads a nested message from react-hook-form's errors by a dotted path. */
function messageAt(errors: FieldErrors, path: string): string | undefined {
  let node: unknown = errors;
  for (const key of path.split('.')) {
    if (node === null || typeof node !== 'object') return undefined;
    node = (node as Record<string, unknown>)[key];
  }
  const message = (node as { message?: unknown } | undefined)?.message;
  return typeof message === 'string' ? message : undefined;
}

const defaults: PlanRequestInput = {
  cavity: { shape: 'box', unit: 'in' } as PlanRequestInput['cavity'],
  displacement: { unit: 'in3' } as PlanRequestInput['displacement'],
  overagePct: 0,
  cupLossG: 0,
  tolerancePct: 1,
  material: { ratio: { basis: 'weight', parts: [] as unknown as number[] } },
};

export interface VolumeEstimatorProps {
  /** A material chosen elsewhere (the bench flow): its ratio and density are not asked for. */
  material?: PlanMaterial;
  /** The bench scale, to warn when it cannot weigh the smallest part within the band. */
  scale?: PlanRequestInput['scale'];
  /** Called with each new plan as the operator types, and `undefined` while input is missing. */
  onPlan?: (plan: PlanResponse | undefined) => void;
  /** Offers a button that hands the plan's total mass back (the bench flow's amount step). */
  onUse?: (totalMassG: number) => void;
  /** The material's own tolerance (the bench flow): used as it is, not asked for. */
  tolerancePct?: number;
}

/**
 * The volume estimator: a cavity, a model and an allowance in; the mass to mix and each part's
 * share out, every step shown. Computes as you type with the protocol's pure functions.
 */
export function VolumeEstimator({
  material,
  scale,
  onPlan,
  onUse,
  tolerancePct,
}: VolumeEstimatorProps) {
  const resolver = useMemo<Resolver<PlanRequestInput>>(() => {
    const base = zodResolver(planRequestSchema) as unknown as Resolver<PlanRequestInput>;
    return (values, context, options) =>
      base(
        {
          ...values,
          ...(material ? { material } : {}),
          ...(scale ? { scale } : {}),
          ...(tolerancePct !== undefined ? { tolerancePct } : {}),
        },
        context,
        options,
      );
  }, [material, scale, tolerancePct]);
  const {
    register,
    control,
    setValue,
    formState: { errors },
  } = useForm<PlanRequestInput>({
    defaultValues: defaults,
    resolver,
    mode: 'onChange',
    shouldUnregister: true,
  });
  const [cylinderBy, setCylinderBy] = useState<'diameter' | 'radius'>('diameter');
  const [withModel, setWithModel] = useState(false);
  const [threeParts, setThreeParts] = useState(false);
  const [densityMode, setDensityMode] = useState<DensityMode>('sg');
  const [withScale, setWithScale] = useState(false);

  const shape = useWatch({ control, name: 'cavity.shape' }) as Shape;
  const basis = useWatch({ control, name: 'material.ratio.basis' });
  const values = useWatch({ control });

  // Length shapes and a known volume take different units under the same field.
  useEffect(() => {
    if (shape === 'volume') setValue('cavity.unit' as never, 'in3' as never);
    else if (shape !== 'water') setValue('cavity.unit' as never, 'in' as never);
  }, [shape, setValue]);

  // A ratio by volume is turned into parts by weight through each part's SG, so ask for those.
  const density: DensityMode = basis === 'volume' ? 'parts' : densityMode;

  const request = useMemo(
    () => ({
      ...values,
      // Without a model the default unit left in the form must not ask for a model volume.
      ...(withModel ? {} : { displacement: undefined }),
      ...(material ? { material } : {}),
      ...(scale ? { scale } : {}),
      ...(tolerancePct !== undefined ? { tolerancePct } : {}),
    }),
    [values, withModel, material, scale, tolerancePct],
  );
  const preview = usePlanPreview(request);
  useEffect(() => {
    onPlan?.(preview.plan);
  }, [preview.plan, onPlan]);

  const err = (path: string) => messageAt(errors, path);
  const reg = register as unknown as UseFormRegister<Record<string, unknown>>;
  const lengthUnit =
    shape === 'water' || shape === 'volume'
      ? undefined
      : (values.cavity as { unit?: string })?.unit;
  const lengthUnitLabel = lengthUnit ? unitLabel(lengthUnit) : undefined;

  return (
    <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_minmax(0,1fr)]">
      <form
        aria-label="Volume estimator"
        noValidate
        onSubmit={(e) => e.preventDefault()}
        className="flex flex-col gap-5"
      >
        <FieldGroup title="Cavity">
          <SelectField
            label="Shape"
            options={SHAPES}
            registration={reg('cavity.shape')}
            error={err('cavity.shape')}
          />
          {shape === 'box' ? (
            <div className="grid gap-4 sm:grid-cols-3">
              <NumberField
                label="Length"
                unit={lengthUnitLabel}
                registration={reg('cavity.length', num)}
                error={err('cavity.length')}
              />
              <NumberField
                label="Width"
                unit={lengthUnitLabel}
                registration={reg('cavity.width', num)}
                error={err('cavity.width')}
              />
              <NumberField
                label="Height"
                unit={lengthUnitLabel}
                registration={reg('cavity.height', num)}
                error={err('cavity.height')}
              />
            </div>
          ) : null}
          {shape === 'cylinder' ? (
            <div className="grid gap-4 sm:grid-cols-3">
              <SelectField
                label="Measured across"
                options={[
                  { value: 'diameter', label: 'Diameter' },
                  { value: 'radius', label: 'Radius' },
                ]}
                value={cylinderBy}
                onChange={(v) => setCylinderBy(v as 'diameter' | 'radius')}
              />
              {cylinderBy === 'diameter' ? (
                <NumberField
                  key="diameter"
                  label="Diameter"
                  unit={lengthUnitLabel}
                  registration={reg('cavity.diameter', num)}
                  error={err('cavity.diameter')}
                />
              ) : (
                <NumberField
                  key="radius"
                  label="Radius"
                  unit={lengthUnitLabel}
                  registration={reg('cavity.radius', num)}
                  error={err('cavity.radius')}
                />
              )}
              <NumberField
                label="Height"
                unit={lengthUnitLabel}
                registration={reg('cavity.height', num)}
                error={err('cavity.height')}
              />
            </div>
          ) : null}
          {shape === 'frustum' ? (
            <div className="grid gap-4 sm:grid-cols-3">
              <NumberField
                label="Top diameter"
                unit={lengthUnitLabel}
                registration={reg('cavity.topDiameter', num)}
                error={err('cavity.topDiameter')}
              />
              <NumberField
                label="Bottom diameter"
                unit={lengthUnitLabel}
                registration={reg('cavity.bottomDiameter', num)}
                error={err('cavity.bottomDiameter')}
              />
              <NumberField
                label="Height"
                unit={lengthUnitLabel}
                registration={reg('cavity.height', num)}
                error={err('cavity.height')}
              />
            </div>
          ) : null}
          {shape === 'box' || shape === 'cylinder' || shape === 'frustum' ? (
            <SelectField
              key="length-unit"
              label="Length unit"
              options={LENGTH_OPTIONS}
              registration={reg('cavity.unit')}
              error={err('cavity.unit')}
            />
          ) : null}
          {shape === 'volume' ? (
            <div className="grid gap-4 sm:grid-cols-2">
              <NumberField
                label="Volume"
                registration={reg('cavity.volume', num)}
                error={err('cavity.volume')}
              />
              <SelectField
                key="volume-unit"
                label="Volume unit"
                options={VOLUME_OPTIONS}
                registration={reg('cavity.unit')}
                error={err('cavity.unit')}
              />
            </div>
          ) : null}
          {shape === 'water' ? (
            <div className="grid gap-4 sm:grid-cols-2">
              <NumberField
                label="Water mass"
                unit="g"
                hint="Fill the cavity with water on the tared scale and read the mass."
                registration={reg('cavity.waterMassG', num)}
                error={err('cavity.waterMassG')}
              />
              <NumberField
                label="Water temperature"
                unit="°C"
                hint="0 to 40 °C"
                registration={reg('cavity.waterTempC', num)}
                error={err('cavity.waterTempC')}
              />
            </div>
          ) : null}
        </FieldGroup>

        <FieldGroup title="Model and allowances">
          <CheckField
            label="Subtract a model in the cavity"
            checked={withModel}
            onChange={setWithModel}
          />
          {withModel ? (
            <div className="grid gap-4 sm:grid-cols-2">
              <NumberField
                label="Model volume"
                hint="From CAD, or the water it displaces."
                registration={reg('displacement.volume', num)}
                error={err('displacement.volume')}
              />
              <SelectField
                label="Model volume unit"
                options={VOLUME_OPTIONS}
                registration={reg('displacement.unit')}
                error={err('displacement.unit')}
              />
            </div>
          ) : null}
          <div className="grid gap-4 sm:grid-cols-2">
            <NumberField
              label="Overage"
              unit="%"
              hint="Added to the net volume: real molds are never perfect shapes."
              registration={reg('overagePct', num)}
              error={err('overagePct')}
            />
            <NumberField
              label="Cup loss"
              unit="g"
              hint="Left on the walls of the first cup when the mix is moved to the second."
              registration={reg('cupLossG', num)}
              error={err('cupLossG')}
            />
          </div>
        </FieldGroup>

        {material ? null : (
          <FieldGroup title="Material">
            <div className="grid gap-4 sm:grid-cols-2">
              <SelectField
                label="Mix ratio"
                options={[
                  { value: 'weight', label: 'Parts by weight' },
                  { value: 'volume', label: 'Parts by volume' },
                ]}
                registration={reg('material.ratio.basis')}
                error={err('material.ratio.basis')}
              />
              <CheckField label="Three parts" checked={threeParts} onChange={setThreeParts} />
            </div>
            <div className="grid gap-4 sm:grid-cols-3">
              {PART_NAMES.slice(0, threeParts ? 3 : 2).map((name, i) => (
                <NumberField
                  key={name}
                  label={`Part ${name}`}
                  registration={reg(`material.ratio.parts.${i}`, num)}
                  error={err(`material.ratio.parts.${i}`)}
                />
              ))}
            </div>
            {err('material.ratio.parts') ? (
              <p className="text-base font-semibold text-over">{err('material.ratio.parts')}</p>
            ) : null}
            <SelectField
              label="Density from"
              options={[
                { value: 'sg', label: 'Specific gravity of the mix' },
                { value: 'yield', label: 'Yield of the mix (in³/lb)' },
                { value: 'parts', label: "Each part's specific gravity" },
              ]}
              value={density}
              disabled={basis === 'volume'}
              onChange={(v) => setDensityMode(v as DensityMode)}
            />
            {density === 'sg' ? (
              <NumberField
                label="Specific gravity"
                hint="From the technical data sheet (water = 1)."
                registration={reg('material.specificGravity', num)}
                error={err('material.specificGravity')}
              />
            ) : null}
            {density === 'yield' ? (
              <NumberField
                label="Yield"
                unit="in³/lb"
                registration={reg('material.yieldIn3PerLb', num)}
                error={err('material.yieldIn3PerLb') ?? err('material.specificGravity')}
              />
            ) : null}
            {density === 'parts' ? (
              <div className="grid gap-4 sm:grid-cols-3">
                {PART_NAMES.slice(0, threeParts ? 3 : 2).map((name, i) => (
                  <NumberField
                    key={name}
                    label={`SG of part ${name}`}
                    registration={reg(`material.partSpecificGravities.${i}`, num)}
                    error={err(`material.partSpecificGravities.${i}`)}
                  />
                ))}
              </div>
            ) : null}
            {err('material.partSpecificGravities') ? (
              <p className="text-base font-semibold text-over">
                {err('material.partSpecificGravities')}
              </p>
            ) : null}
          </FieldGroup>
        )}

        <FieldGroup title="Weighing">
          {tolerancePct === undefined ? (
            <NumberField
              label="Tolerance"
              unit="%"
              hint="Each part is weighed within ± this much."
              registration={reg('tolerancePct', num)}
              error={err('tolerancePct')}
            />
          ) : (
            <p className="text-lg">
              Each part is weighed within ± {tolerancePct} %, the material&apos;s tolerance.
            </p>
          )}
          {scale ? null : (
            <>
              <CheckField
                label="Check against my scale"
                checked={withScale}
                onChange={setWithScale}
              />
              {withScale ? (
                <div className="grid gap-4 sm:grid-cols-2">
                  <NumberField
                    label="Readability"
                    unit="g"
                    hint="The smallest step the display shows."
                    registration={reg('scale.readabilityG', num)}
                    error={err('scale.readabilityG')}
                  />
                  <NumberField
                    label="Repeatability"
                    unit="g"
                    hint="Leave empty if unknown."
                    registration={reg('scale.repeatabilityG', num)}
                    error={err('scale.repeatabilityG')}
                  />
                  <NumberField
                    label="Capacity"
                    unit="g"
                    registration={reg('scale.capacityG', num)}
                    error={err('scale.capacityG')}
                  />
                  <NumberField
                    label="Cup mass"
                    unit="g"
                    registration={reg('scale.cupMassG', num)}
                    error={err('scale.cupMassG')}
                  />
                </div>
              ) : null}
            </>
          )}
        </FieldGroup>
      </form>

      <section
        aria-label="Pour plan"
        aria-live="polite"
        className="flex flex-col gap-4 lg:sticky lg:top-6 lg:self-start"
      >
        {preview.plan ? (
          <>
            <PlanSteps plan={preview.plan} />
            {onUse ? (
              <button
                type="button"
                onClick={() => onUse(preview.plan!.totalMassG)}
                className="min-h-14 rounded-xl bg-steel px-6 text-xl font-semibold text-paper"
              >
                Use this total: {formatMass(preview.plan.totalMassG, 'g')}
              </button>
            ) : null}
            {preview.plan.warnings.length > 0 ? (
              <ul aria-label="Warnings" className="flex flex-col gap-2">
                {preview.plan.warnings.map((w) => (
                  <li
                    key={w.code}
                    className={`rounded-md border-l-8 p-3 text-lg ${w.code === 'PART_VOLUMES_FROM_MIX_SG' ? 'border-line bg-panel' : 'border-brass bg-panel font-semibold'}`}
                  >
                    {w.message}
                  </li>
                ))}
              </ul>
            ) : null}
          </>
        ) : (
          <div className="rounded-lg border-2 border-dashed border-line p-5">
            <h2 className="text-xl font-bold">The plan needs</h2>
            <ul className="mt-2 list-disc pl-6 text-lg">
              {[...new Set(preview.problems.map((p) => p.message))].map((m) => (
                <li key={m}>{m}</li>
              ))}
            </ul>
          </div>
        )}
        <p className="text-base text-muted">
          Large masses can overheat from their own exotherm, and the parts can sensitise skin and
          lungs. Mix no more at once than the material&apos;s technical data sheet allows, and
          follow its safety data sheet, your local codes and licensed practice for gloves, eye
          protection and ventilation.
        </p>
      </section>
    </div>
  );
}
