import { ApiRequestError } from '../../../lib/api-client';

/** What the hub said when it refused (its own words), or why it could not be asked. */
export function HubError({ error, what }: { error: Error | null; what: string }) {
  if (!error) return null;
  const fields = error instanceof ApiRequestError ? error.body.errors : [];
  return (
    <div role="alert" className="rounded-xl border-l-8 border-over bg-panel p-4 text-xl">
      <p className="font-semibold">
        {what}: {error.message}
      </p>
      {fields.length > 0 && (
        <ul className="mt-1 list-disc pl-6">
          {fields.map((f) => (
            <li key={`${f.path}:${f.message}`}>{f.message}</li>
          ))}
        </ul>
      )}
    </div>
  );
}
