import type { BatchFitness, Material } from '@tareline/protocol';
import { formatGrams } from '../../../lib/grams';
import { partName } from '../../../lib/parts';
import { secondaryButton } from './buttons';

/**
 * Said before weighing when a part of the planned batch is below what this bench's scale weighs
 * within the band: the verdict would hang on the last digit. Offers the smallest batch it can
 * weigh; a smaller one starts only with a lead's leave.
 */
export function ScaleFitnessWarning({
  fitness,
  material,
  onUseSmallest,
}: {
  fitness: BatchFitness;
  material: Pick<Material, 'partLabels' | 'tolerancePct'>;
  onUseSmallest: (totalMassG: number) => void;
}) {
  const smallest = formatGrams(fitness.smallestBatchG, 2);
  return (
    <section
      role="alert"
      aria-labelledby="scale-fitness-title"
      className="flex flex-col gap-3 rounded-2xl border-l-8 border-brass bg-panel p-6"
    >
      <h3 id="scale-fitness-title" className="text-[2rem] leading-tight font-bold">
        Too small for this scale
      </h3>
      <ul className="text-2xl">
        {fitness.tooSmall.map(({ part, targetG }) => (
          <li key={part}>
            {partName(part, material.partLabels[part])} would be{' '}
            <strong>{formatGrams(targetG, 3)} g</strong>; this scale weighs within ±
            {material.tolerancePct} % only from <strong>{formatGrams(fitness.minNetG, 2)} g</strong>
            .
          </li>
        ))}
      </ul>
      <p className="text-2xl">
        The smallest batch it can weigh is <strong>{smallest} g</strong>
        {fitness.sSource === 'measured'
          ? ' (from its measured repeatability).'
          : ' (from its scale interval).'}{' '}
        A smaller batch starts only with a lead&apos;s e-mail and password.
      </p>
      <div>
        <button
          type="button"
          onClick={() => onUseSmallest(fitness.smallestBatchG)}
          className={secondaryButton}
        >
          Use {smallest} g
        </button>
      </div>
    </section>
  );
}
