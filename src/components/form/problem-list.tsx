import { isApiError } from '@/lib/api-client';

/** An API error with each of its details (what is wrong and where), for a notice. */
export function ProblemList({ error }: { error: unknown }) {
  if (!isApiError(error)) return <p>{error instanceof Error ? error.message : 'Something went wrong.'}</p>;
  // A detail that only repeats the message is not listed again.
  const details = error.details.filter((d) => d.message !== error.message);
  return (
    <>
      <p>{error.message}</p>
      {details.length ? (
        <ul className="mt-1 list-disc pl-5">
          {details.map((d, i) => (
            <li key={i}>
              {d.path.length ? <span className="font-mono">{d.path.join('.')}: </span> : null}
              {d.message}
            </li>
          ))}
        </ul>
      ) : null}
    </>
  );
}
