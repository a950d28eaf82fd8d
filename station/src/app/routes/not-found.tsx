import { Link } from 'react-router-dom';

export function NotFoundRoute() {
  return (
    <section className="mx-auto max-w-3xl">
      <h1 className="text-3xl font-bold">Page not found</h1>
      <p className="mt-2 text-lg">
        <Link className="underline" to="/bench">
          Go to the bench
        </Link>
      </p>
    </section>
  );
}
