/** The review pages: batches, materials and lots for leads. Filled in by the review work. */
export function ReviewRoute() {
  return (
    <section aria-labelledby="review-title" className="mx-auto max-w-3xl">
      <h1 id="review-title" className="text-3xl font-bold">
        Review
      </h1>
      <p className="mt-2 text-lg text-muted">
        Batches, materials and lots for leads. These pages are being built.
      </p>
    </section>
  );
}
