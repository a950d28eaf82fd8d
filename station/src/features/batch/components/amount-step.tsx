import { zodResolver } from '@hookform/resolvers/zod';
import {
  createBatchSchema,
  type Material,
  type PlanMaterial,
  type PlanRequestInput,
} from '@tareline/protocol';
import { useMemo, useState, type ComponentType } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { z } from 'zod';
import { asNumber, NumberField } from '../../../components/form/field';
import { useBenches } from '../../../lib/benches';
import { benchFitness } from '../utils/scale-fitness';
import { primaryButton, secondaryButton } from './buttons';
import { ScaleFitnessWarning } from './scale-fitness-warning';

const amountSchema = z.object({ totalMassG: createBatchSchema.shape.totalMassG });
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
  const typed = useWatch({ control, name: 'totalMassG' });
  const fitness = benchFitness(material, typeof typed === 'number' ? typed : undefined, bench);
  const planMaterial = useMemo<PlanMaterial>(
    () => ({
      ratio: material.ratio,
      ...(material.specificGravity !== undefined && { specificGravity: material.specificGravity }),
      ...(material.yieldIn3PerLb !== undefined && { yieldIn3PerLb: material.yieldIn3PerLb }),
      ...(material.partSpecificGravities !== undefined && {
        partSpecificGravities: material.partSpecificGravities,
      }),
    }),
    [material],
  );
  const planScale = useMemo(
    () =>
      scale && {
        readabilityG: scale.readabilityG,
        ...(scale.capacityG !== undefined && { capacityG: scale.capacityG }),
      },
    [scale],
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
      </form>
      {fitness && fitness.tooSmall.length > 0 && (
        <ScaleFitnessWarning
          fitness={fitness}
          material={material}
          onUseSmallest={(g) => setValue('totalMassG', g, { shouldValidate: true })}
        />
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
