import { zodResolver } from '@hookform/resolvers/zod';
import {
  batchTotalMassSchema,
  partsOfTotal,
  planMaterialOf,
  type Material,
  type PlanMaterial,
  type PlanRequestInput,
} from '@tareline/protocol';
import { lazy, Suspense, useMemo, useState, type ComponentType } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { z } from 'zod';
import { asNumber, NumberField } from '../../../components/form/field';
import { useBenches } from '../../../lib/benches';
import { benchFitness } from '../utils/scale-fitness';
import { primaryButton, secondaryButton } from './buttons';
import { ScaleFitnessWarning } from './scale-fitness-warning';

// Measuring without a scale is rare at a bench built around one: its code loads when asked for.
const NoScaleTools = lazy(() =>
  import('../../../components/bench-tools/no-scale-tools').then((m) => ({
    default: m.NoScaleTools,
  })),
);

const amountSchema = z.object({ totalMassG: batchTotalMassSchema });
type AmountForm = z.input<typeof amountSchema>;

/**
 * The volume estimator, handed in by the app (features do not import each other): it takes the
 * chosen material, its tolerance and the bench scale, and hands back a total mass to use.
 */
export type Estimator = ComponentType<{
  material: PlanMaterial;
  tolerancePct: number;
  scale?: PlanRequestInput['scale'];
  onUse: (totalMassG: number) => void;
}>;

/** Step 2: the total mass to mix, typed or worked out with the volume estimator. */
export function AmountStep({
  benchId,
  material,
  initialG,
  estimator: VolumeEstimator,
  onDone,
}: {
  benchId: string;
  material: Material;
  initialG: number | undefined;
  estimator: Estimator;
  onDone: (totalMassG: number) => void;
}) {
  const [estimating, setEstimating] = useState(false);
  const [noScale, setNoScale] = useState(false);
  const {
    register,
    handleSubmit,
    setValue,
    control,
    formState: { errors },
  } = useForm<AmountForm>({
    resolver: zodResolver(amountSchema),
    defaultValues: initialG === undefined ? {} : { totalMassG: initialG },
  });
  const benches = useBenches();
  const bench = benches.data?.find((b) => b.id === benchId);
  const scale = bench?.scale;
  const planMaterial = useMemo<PlanMaterial>(() => planMaterialOf(material), [material]);
  const typedG = asNumber(useWatch({ control, name: 'totalMassG' }));
  const fitness = benchFitness(material, typedG, bench);
  const noScaleParts = useMemo(() => {
    const parsed = batchTotalMassSchema.safeParse(typedG);
    if (!parsed.success) return undefined;
    return partsOfTotal(parsed.data, material).map((p, i) => ({
      ...p,
      label: material.partLabels[i] ?? `Part ${'ABC'[i]}`,
    }));
  }, [typedG, material]);
  const repeatabilitySdG = bench?.repeatabilitySdG;
  const planScale = useMemo(
    () =>
      scale && {
        readabilityG: scale.readabilityG,
        ...(scale.capacityG !== undefined && { capacityG: scale.capacityG }),
        // The bench's measured repeatability, as the hub's own fitness check uses it.
        ...(repeatabilitySdG != null && { repeatabilityG: repeatabilitySdG }),
      },
    [scale, repeatabilitySdG],
  );
  const error = errors.totalMassG?.message;

  return (
    <div className="flex flex-col gap-6">
      <form
        noValidate
        aria-label="Amount"
        onSubmit={handleSubmit((v) => onDone(amountSchema.parse(v).totalMassG))}
        className="flex flex-wrap items-end gap-4"
      >
        <NumberField
          label="Total mass to mix"
          unit="g"
          size="bench"
          inputClassName="h-16 w-56"
          error={error}
          {...register('totalMassG', { setValueAs: asNumber })}
        />
        <button type="submit" className={primaryButton}>
          Next: lots
        </button>
        <button
          type="button"
          aria-expanded={estimating}
          onClick={() => setEstimating((e) => !e)}
          className={secondaryButton}
        >
          {estimating ? 'Close the volume estimator' : 'Work it out from the mold'}
        </button>
        <button
          type="button"
          aria-expanded={noScale}
          onClick={() => setNoScale((n) => !n)}
          className={secondaryButton}
        >
          {noScale ? 'Close: back to the scale' : 'No scale here'}
        </button>
      </form>
      {fitness && fitness.tooSmall.length > 0 && (
        <ScaleFitnessWarning
          fitness={fitness}
          material={material}
          onUseSmallest={(g) => setValue('totalMassG', g, { shouldValidate: true })}
        />
      )}
      {noScale && (
        <section aria-label="No scale here" className="flex flex-col gap-4">
          <p className="text-lg">
            Without a scale nothing is weighed, judged or recorded: measure by volume or by pump
            strokes, and the batch is not in Tareline.
          </p>
          {noScaleParts ? (
            <Suspense fallback={<p className="text-xl text-muted">Loading the bench tools…</p>}>
              <NoScaleTools parts={noScaleParts} />
            </Suspense>
          ) : (
            <p className="text-xl">Enter the total mass to mix first.</p>
          )}
        </section>
      )}
      {estimating && (
        <VolumeEstimator
          material={planMaterial}
          tolerancePct={material.tolerancePct}
          {...(planScale ? { scale: planScale } : {})}
          onUse={(totalMassG) => {
            // Up to whole tenths of a gram: a short batch spoils the pour, a tenth more costs
            // nothing. The small allowance keeps float noise (165.000…01) from adding a tenth.
            setValue('totalMassG', Math.ceil(totalMassG * 10 - 1e-6) / 10, {
              shouldValidate: true,
            });
            setEstimating(false);
          }}
        />
      )}
    </div>
  );
}
