import { Link } from 'react-router-dom';
import { hasRole, useSession } from '../../lib/auth';

/** The review pages: batches, materials and lots for leads. Filled in by the review work. */
export function ReviewRoute() {
  const session = useSession();
  return (
    <section aria-labelledby="review-title" className="mx-auto max-w-3xl">
      <h1 id="review-title" className="text-3xl font-bold">
        Review
      </h1>
      <p className="mt-2 text-lg text-muted">Batches, materials and lots for leads.</p>
      <p className="mt-4 text-lg">
        <Link className="underline" to="/review/batches">
          Batches
        </Link>
      </p>
      <p className="mt-4 text-lg">
        <Link className="underline" to="/review/batches?state=saved&verdict=NO-GO&disposition=none">
          NO-GO batches to decide
        </Link>
      </p>
      <p className="mt-4 text-lg">
        <Link className="underline" to="/review/benches">
          Every bench, live
        </Link>
      </p>
      <p className="mt-4 text-lg">
        <Link className="underline" to="/materials">
          Materials, lots and stock
        </Link>
      </p>
      <p className="mt-4 text-lg">
        <Link className="underline" to="/plans">
          Pour plans
        </Link>
      </p>
      <p className="mt-4 text-lg">
        <Link className="underline" to="/review/accuracy">
          Accuracy over time
        </Link>
      </p>
      {hasRole(session, ['admin']) && (
        <p className="mt-4 text-lg">
          <Link className="underline" to="/review/people">
            People and badges
          </Link>
        </p>
      )}
    </section>
  );
}
