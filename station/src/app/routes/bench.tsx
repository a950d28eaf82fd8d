import { BenchScreen } from '../../features/auth/components/bench-screen';

/** The bench screen: sign-in while nobody is signed in here, else the bench's pages. */
export function BenchRoute() {
  return <BenchScreen />;
}

/** What a signed-in operator sees first. The guided flow arrives with the bench work. */
export function BenchHomeRoute() {
  return (
    <section aria-labelledby="bench-title" className="mx-auto max-w-3xl">
      <h1 id="bench-title" className="text-3xl font-bold">
        Bench
      </h1>
      <p className="mt-2 text-lg text-muted">
        Weigh part A and part B against the target, with the verdict shown as you pour. The live
        gauge and the guided flow are being built.
      </p>
    </section>
  );
}
