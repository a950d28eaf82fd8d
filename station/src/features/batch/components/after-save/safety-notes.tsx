/**
 * General cautions for handling a mixed batch, with the material's own cautions first. Never a
 * claim that the batch is safe: the data sheet and local rules decide.
 */
export function SafetyNotes({ cautions, sdsRef }: { cautions: string[]; sdsRef?: string }) {
  // The SDS line always shows; the full list (shown in full on the prepare step) folds out, so
  // the saved step fits one bench screen.
  return (
    <section aria-labelledby="safety-title" className="space-y-1 rounded-xl bg-panel px-4 py-3">
      <h3 id="safety-title" className="text-2xl font-bold">
        Handle with care
      </h3>
      <p className="text-sm font-semibold">
        Gloves, eye protection, ventilation. The safety data sheet
        {sdsRef ? <> ({sdsRef})</> : null} and your local rules come first; this screen does not say
        the batch is safe.
      </p>
      <details>
        <summary className="flex min-h-14 cursor-pointer items-center text-lg font-semibold">
          All the cautions
        </summary>
        <ul className="list-disc space-y-1 pl-6 text-base">
          {cautions.map((caution) => (
            <li key={caution}>{caution}</li>
          ))}
          <li>
            Keep gloves and eye protection on while mixing and pouring, and work with ventilation:
            uncured resins and hardeners can sensitise skin and lungs.
          </li>
          <li>
            A mixed batch heats itself as it cures. Do not leave leftovers as a large mass in the
            cup or throw them in a bin while hot; let them cure spread out, away from anything that
            burns.
          </li>
        </ul>
      </details>
    </section>
  );
}
