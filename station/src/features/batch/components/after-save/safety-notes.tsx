/**
 * General cautions for handling a mixed batch, with the material's own cautions first. Never a
 * claim that the batch is safe: the data sheet and local rules decide.
 */
export function SafetyNotes({ cautions, sdsRef }: { cautions: string[]; sdsRef?: string }) {
  return (
    <section aria-labelledby="safety-title" className="space-y-3 rounded-xl bg-panel p-6">
      <h3 id="safety-title" className="text-2xl font-bold">
        Handle with care
      </h3>
      <ul className="list-disc space-y-1 pl-6 text-lg">
        {cautions.map((caution) => (
          <li key={caution}>{caution}</li>
        ))}
        <li>
          Keep gloves and eye protection on while mixing and pouring, and work with ventilation:
          uncured resins and hardeners can sensitise skin and lungs.
        </li>
        <li>
          A mixed batch heats itself as it cures. Do not leave leftovers as a large mass in the cup
          or throw them in a bin while hot; let them cure spread out, away from anything that burns.
        </li>
      </ul>
      <p className="text-lg font-semibold">
        The material&apos;s safety data sheet
        {sdsRef ? <> ({sdsRef})</> : null} and your local rules come first. This screen only says
        the batch was weighed; it does not say it is safe.
      </p>
    </section>
  );
}
