import { useState } from 'react';

interface Step {
  title: string;
  detail: string;
}

/**
 * Hand-mixing a weighed batch in a cup. The minutes and the double-cup transfer are common
 * practice for small hand-mixed batches, no published source; a data sheet that gives its own
 * mixing time or method comes first. (A material's `agitateMin` is not a mixing time: it is for
 * stirring a settled part in its own can before weighing.)
 */
function mixingSteps(partCount: number, verdict: 'GO' | 'NO-GO' | null): Step[] {
  if (verdict === 'NO-GO') {
    // A NO-GO cup is not poured: a lead decides what happens to it.
    return [
      {
        title: 'Keep the cup apart',
        detail: 'Set it aside, away from the cups to pour, with its label on it.',
      },
      {
        title: 'Tell a lead',
        detail: 'The lead decides whether it is scrapped or used elsewhere; it is on their list.',
      },
      {
        title: 'Do not pour it into the mold',
        detail:
          'Off-ratio material may never fully cure. Dispose of it as the SDS says if told to.',
      },
    ];
  }
  const parts = partCount > 2 ? 'part A, part B and part C' : 'part A and part B';
  return [
    {
      title: `Mix ${parts}`,
      detail:
        'About 2 minutes with a flat stick, scraping the sides and the bottom of the cup as you go.',
    },
    {
      title: 'Transfer to a second clean cup',
      detail:
        'The double-cup method: material stuck unmixed to the first cup’s walls and bottom stays behind.',
    },
    {
      title: 'Mix again',
      detail: 'About 1 minute more with a clean stick, scraping the sides and bottom again.',
    },
    {
      title: 'Pour',
      detail:
        'In a thin steady stream into the lowest point of the mold, to keep air out, well within the pot life.',
    },
  ];
}

/** The mixing steps as a checklist the operator ticks off with a gloved finger. */
export function MixingSteps({
  partCount,
  verdict = null,
}: {
  partCount: number;
  verdict?: 'GO' | 'NO-GO' | null;
}) {
  const steps = mixingSteps(partCount, verdict);
  const [done, setDone] = useState<boolean[]>(() => steps.map(() => false));
  const doneCount = done.filter(Boolean).length;
  const toggle = (index: number) =>
    setDone((was) => was.map((value, i) => (i === index ? !value : value)));

  return (
    <section aria-labelledby="mixing-title" className="space-y-2 rounded-xl bg-panel p-4">
      <div className="flex items-baseline justify-between gap-4">
        <h3 id="mixing-title" className="text-2xl font-bold">
          {verdict === 'NO-GO' ? 'What to do with this cup' : 'Mixing steps'}
        </h3>
        <p className="text-xl text-muted" aria-live="polite">
          {doneCount === steps.length ? 'All done' : `${doneCount} of ${steps.length} done`}
        </p>
      </div>
      <ol className="space-y-2">
        {steps.map((step, index) => (
          <li key={step.title}>
            <label
              className={`flex min-h-14 cursor-pointer items-center gap-4 rounded-lg border-2 px-3 py-1 ${done[index] ? 'border-go' : 'border-line'}`}
            >
              <input
                type="checkbox"
                checked={done[index]}
                onChange={() => toggle(index)}
                aria-labelledby={`mix-step-${index}`}
                aria-describedby={`mix-step-${index}-detail`}
                className="h-10 w-10 shrink-0 accent-go"
              />
              <span>
                <span id={`mix-step-${index}`} className="block text-xl font-bold">
                  {index + 1}. {step.title}
                </span>
                <span
                  id={`mix-step-${index}-detail`}
                  className="block text-sm leading-snug text-muted"
                >
                  {step.detail}
                </span>
              </span>
            </label>
          </li>
        ))}
      </ol>
    </section>
  );
}
