import { errorMessage } from '@/lib/api-client';
import { Alert } from './alert';

/** The form-level error: the server's `detail`, plus any messages that fit no field. */
export function FormAlert({ error, extra = [] }: { error: unknown; extra?: readonly string[] }) {
  if (!error) return null;
  return (
    <Alert tone="danger" role="alert">
      <p>{errorMessage(error)}</p>
      {extra.length > 0 ? (
        <ul className="mt-1 list-disc pl-5">
          {extra.map((message) => (
            <li key={message}>{message}</li>
          ))}
        </ul>
      ) : null}
    </Alert>
  );
}
