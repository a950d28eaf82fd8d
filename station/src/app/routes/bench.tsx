/** The bench screen: operators sign in and weigh here. The guided flow arrives with the bench work. */
export function BenchRoute() {
  return (
    <section aria-labelledby="bench-title" className="mx-auto max-w-3xl">
      <h1 id="bench-title" className="text-3xl font-bold">
        Bench
      </h1>
      <p className="mt-2 text-lg text-muted">
        Weigh part A and part B against the target, with the verdict shown as you pour. Sign-in and
        the live gauge are being built.
      </p>
    </section>
  );
}
