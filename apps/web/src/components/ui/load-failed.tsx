import { errorMessage } from '@/lib/api-client';
import { Alert } from './alert';
import { Button } from './button';

/** What a section shows when its data could not be loaded: the reason and a way to ask again. */
export function LoadFailed({
  what,
  error,
  onRetry,
  retrying,
}: {
  /** Read as "The {what} could not be loaded". */
  what: string;
  error: unknown;
  onRetry: () => void;
  retrying?: boolean;
}) {
  return (
    <Alert tone="danger" title={`The ${what} could not be loaded`}>
      <p>{errorMessage(error)}</p>
      <Button size="sm" variant="secondary" className="mt-2" onClick={onRetry} pending={retrying}>
        Try again
      </Button>
    </Alert>
  );
}
