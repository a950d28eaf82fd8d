import { zodResolver } from '@hookform/resolvers/zod';
import {
  LENGTH_UNITS,
  planRequestSchema,
  unitLabel,
  VOLUME_UNITS,
  type PlanMaterial,
  type PlanRequest,
  type PlanRequestInput,
  type PlanResponse,
} from '@tareline/protocol';
import { useEffect, useMemo, useRef, useState } from 'react';
import { NoScaleTools } from '../../../components/bench-tools/no-scale-tools';
import {
  get,
  useForm,
  useWatch,
  type FieldError,
  type Path,
  type Resolver,
  type UseFormRegister,
} from 'react-hook-form';
import { usePlanPreview } from '../hooks/use-plan-preview';
import { formatMass } from '../utils/format';
import {
  asNumber,
  CheckField,
  FieldGroup,
  NumberField,
  SelectField,
} from '../../../components/form/field';
import { partLetter } from '../../../lib/parts';
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

const num = { setValueAs: asNumber };
type FieldName = Path<PlanRequestInput>;

/** One typed number of a cavity: its field, label, and the unit shown beside it. */
interface Dimension {
  name: FieldName;
  label: string;
  /** `length` shows the length unit chosen below; anything else is shown as it is. */
  unit?: 'length' | '°C' | 'g';
  hint?: string;
  /** A cylinder is measured across by diameter or by radius: the field shown for one of them. */
  across?: 'diameter' | 'radius';
}

/** The fields of one cavity shape, and where its unit is chosen. */
interface ShapeForm {
  grid: string;
  dimensions: readonly Dimension[];
  unitSelect?: { label: string; options: readonly { value: string; label: string }[] };
  /** The unit choice sits in the grid beside the one number (a known volume). */
  unitInGrid?: boolean;
  /** A cylinder asks first whether it was measured by diameter or radius. */
  measuredAcross?: boolean;
}

const LENGTH_UNIT_SELECT = { label: 'Length unit', options: LENGTH_OPTIONS };
const height: Dimension = { name: 'cavity.height', label: 'Height', unit: 'length' };

const SHAPE_FORMS: Record<Shape, ShapeForm> = {
  box: {
    grid: 'grid gap-4 sm:grid-cols-3',
    dimensions: [
      { name: 'cavity.length', label: 'Length', unit: 'length' },
      { name: 'cavity.width', label: 'Width', unit: 'length' },
      height,
    ],
    unitSelect: LENGTH_UNIT_SELECT,
  },
  cylinder: {
    grid: 'grid gap-4 sm:grid-cols-3',
    measuredAcross: true,
    dimensions: [
      { name: 'cavity.diameter', label: 'Diameter', unit: 'length', across: 'diameter' },
      { name: 'cavity.radius', label: 'Radius', unit: 'length', across: 'radius' },
      height,
    ],
    unitSelect: LENGTH_UNIT_SELECT,
  },
  frustum: {
    grid: 'grid gap-4 sm:grid-cols-3',
    dimensions: [
      { name: 'cavity.topDiameter', label: 'Top diameter', unit: 'length' },
      { name: 'cavity.bottomDiameter', label: 'Bottom diameter', unit: 'length' },
      height,
    ],
    unitSelect: LENGTH_UNIT_SELECT,
  },
  volume: {
    grid: 'grid gap-4 sm:grid-cols-2',
    dimensions: [{ name: 'cavity.volume', label: 'Volume' }],
    unitSelect: { label: 'Volume unit', options: VOLUME_OPTIONS },
    unitInGrid: true,
  },
  water: {
    grid: 'grid gap-4 sm:grid-cols-2',
    dimensions: [
      {
        name: 'cavity.waterMassG',
        label: 'Water mass',
        unit: 'g',
        hint: 'Fill the cavity with water on the tared scale and read the mass.',
      },
      { name: 'cavity.waterTempC', label: 'Water temperature', unit: '°C', hint: '0 to 40 °C' },
    ],
  },
};

const ACROSS_OPTIONS = [
  { value: 'diameter', label: 'Diameter' },
  { value: 'radius', label: 'Radius' },
];

/** The numbers of the chosen cavity shape, drawn from its row of `SHAPE_FORMS`. */
function CavityFields({
  form,
  register,
  err,
  lengthUnit,
  cylinderBy,
  onCylinderBy,
}: {
  form: ShapeForm;
  register: UseFormRegister<PlanRequestInput>;
  err: (path: string) => string | undefined;
  lengthUnit: string | undefined;
  cylinderBy: 'diameter' | 'radius';
  onCylinderBy: (by: 'diameter' | 'radius') => void;
}) {
  const unitSelect = form.unitSelect && (
    // Keyed by its label: a length unit and a volume unit are different fields to the form.
    <SelectField
      key={form.unitSelect.label}
      label={form.unitSelect.label}
      options={form.unitSelect.options}
      error={err('cavity.unit')}
      {...register('cavity.unit')}
    />
  );
  return (
    <>
      <div className={form.grid}>
        {form.measuredAcross ? (
          <SelectField
            label="Measured across"
            options={ACROSS_OPTIONS}
            value={cylinderBy}
            onPick={(by: string) => onCylinderBy(by === 'radius' ? 'radius' : 'diameter')}
          />
        ) : null}
        {form.dimensions
          .filter((d) => d.across === undefined || d.across === cylinderBy)
          .map((d) => (
            <NumberField
              key={d.name}
              label={d.label}
              unit={d.unit === 'length' ? lengthUnit : d.unit}
              hint={d.hint}
              error={err(d.name)}
              {...register(d.name, num)}
            />
          ))}
        {form.unitInGrid ? unitSelect : null}
      </div>
      {form.unitInGrid ? null : unitSelect}
    </>
  );
}

const defaults: PlanRequestInput = {
  cavity: { shape: 'box', unit: 'in' } as PlanRequestInput['cavity'],
  displacement: { unit: 'in3' } as PlanRequestInput['displacement'],
  overagePct: 0,
  cupLossG: 0,
  tolerancePct: 1,
  material: { ratio: { basis: 'weight', parts: [] } },
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
  /** Called with each complete request as typed (a pour plan saves its cavity and allowances). */
  onRequest?: (request: PlanRequest | undefined) => void;
  /** Cavity and allowances to start from (editing a saved pour plan). */
  initial?: Pick<PlanRequestInput, 'cavity' | 'displacement' | 'overagePct' | 'cupLossG'>;
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
  onRequest,
  initial,
}: VolumeEstimatorProps) {
  const resolver = useMemo<Resolver<PlanRequestInput, unknown, PlanRequest>>(() => {
    const base = zodResolver(planRequestSchema);
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
  } = useForm<PlanRequestInput, unknown, PlanRequest>({
    defaultValues: initial ? { ...defaults, ...initial } : defaults,
    resolver,
    mode: 'onChange',
    shouldUnregister: true,
  });
  const [cylinderBy, setCylinderBy] = useState<'diameter' | 'radius'>(
    initial?.cavity && 'radius' in initial.cavity && initial.cavity.radius !== undefined
      ? 'radius'
      : 'diameter',
  );
  const [withModel, setWithModel] = useState(!!initial?.displacement);
  const [threeParts, setThreeParts] = useState(false);
  const [densityMode, setDensityMode] = useState<DensityMode>('sg');
  const [withScale, setWithScale] = useState(false);

  const shape = useWatch({ control, name: 'cavity.shape' }) as Shape;
  const basis = useWatch({ control, name: 'material.ratio.basis' });
  const values = useWatch({ control });

  // Length shapes and a known volume take different units under the same field: a new shape
  // starts in its usual unit, the shape the form opened with keeps the unit it was given.
  const shownShape = useRef(shape);
  useEffect(() => {
    if (shape === shownShape.current) return;
    shownShape.current = shape;
    if (shape === 'volume') setValue('cavity.unit', 'in3');
    else if (shape !== 'water') setValue('cavity.unit', 'in');
  }, [shape, setValue]);

  // A ratio by volume is turned into parts by weight through each part's SG, so ask for those.
  const density: DensityMode = basis === 'volume' ? 'parts' : densityMode;
  const partIndexes = threeParts ? [0, 1, 2] : [0, 1];

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
  useEffect(() => {
    onRequest?.(preview.request);
  }, [preview.request, onRequest]);

  const err = (path: string): string | undefined =>
    get<typeof errors, FieldError | undefined>(errors, path)?.message;
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
            error={err('cavity.shape')}
            {...register('cavity.shape')}
          />
          <CavityFields
            form={SHAPE_FORMS[shape]}
            register={register}
            err={err}
            lengthUnit={lengthUnitLabel}
            cylinderBy={cylinderBy}
            onCylinderBy={setCylinderBy}
          />
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
                {...register('displacement.volume', num)}
                error={err('displacement.volume')}
              />
              <SelectField
                label="Model volume unit"
                options={VOLUME_OPTIONS}
                {...register('displacement.unit')}
                error={err('displacement.unit')}
              />
            </div>
          ) : null}
          <div className="grid gap-4 sm:grid-cols-2">
            <NumberField
              label="Overage"
              unit="%"
              hint="Added to the net volume: real molds are never perfect shapes."
              {...register('overagePct', num)}
              error={err('overagePct')}
            />
            <NumberField
              label="Cup loss"
              unit="g"
              hint="Left on the walls of the first cup when the mix is moved to the second."
              {...register('cupLossG', num)}
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
                {...register('material.ratio.basis')}
                error={err('material.ratio.basis')}
              />
              <CheckField label="Three parts" checked={threeParts} onChange={setThreeParts} />
            </div>
            <div className="grid gap-4 sm:grid-cols-3">
              {partIndexes.map((i) => (
                <NumberField
                  key={i}
                  label={`Part ${partLetter(i)}`}
                  {...register(`material.ratio.parts.${i}`, num)}
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
              onPick={(v: string) => setDensityMode(v === 'yield' || v === 'parts' ? v : 'sg')}
            />
            {density === 'sg' ? (
              <NumberField
                label="Specific gravity"
                hint="From the technical data sheet (water = 1)."
                {...register('material.specificGravity', num)}
                error={err('material.specificGravity')}
              />
            ) : null}
            {density === 'yield' ? (
              <NumberField
                label="Yield"
                unit="in³/lb"
                {...register('material.yieldIn3PerLb', num)}
                error={err('material.yieldIn3PerLb') ?? err('material.specificGravity')}
              />
            ) : null}
            {density === 'parts' ? (
              <div className="grid gap-4 sm:grid-cols-3">
                {partIndexes.map((i) => (
                  <NumberField
                    key={i}
                    label={`SG of part ${partLetter(i)}`}
                    {...register(`material.partSpecificGravities.${i}`, num)}
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
              {...register('tolerancePct', num)}
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
                    {...register('scale.readabilityG', num)}
                    error={err('scale.readabilityG')}
                  />
                  <NumberField
                    label="Repeatability"
                    unit="g"
                    hint="Leave empty if unknown."
                    {...register('scale.repeatabilityG', num)}
                    error={err('scale.repeatabilityG')}
                  />
                  <NumberField
                    label="Capacity"
                    unit="g"
                    {...register('scale.capacityG', num)}
                    error={err('scale.capacityG')}
                  />
                  <NumberField
                    label="Cup mass"
                    unit="g"
                    {...register('scale.cupMassG', num)}
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
            <details className="rounded-xl bg-panel p-4 ring-1 ring-line">
              <summary className="cursor-pointer text-xl font-semibold">
                No scale: fill marks and pump strokes
              </summary>
              <div className="mt-3">
                <NoScaleTools
                  parts={preview.plan.parts.map((p) => ({
                    label: `part ${p.name}`,
                    massG: p.massG,
                    volumeCm3: p.volumeCm3,
                  }))}
                />
              </div>
            </details>
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
