import { MutationCache, QueryCache, QueryClient } from '@tanstack/react-query';
import { toast } from 'sonner';
import { ApiError, errorMessage } from './api-client';

interface AppMeta extends Record<string, unknown> {
  /** Set to false when the screen shows the error itself (forms, inline empty states). */
  errorToast?: boolean;
  /** Marks the session query, whose 401 means "signed out", not "session expired". */
  session?: boolean;
}

declare module '@tanstack/react-query' {
  interface Register {
    queryMeta: AppMeta;
    mutationMeta: AppMeta;
  }
}

export interface QueryClientHooks {
  /** Called when the API answers 401 to anything but the session query: the session ended. */
  onUnauthorized?: () => void;
}

function shouldRetry(failureCount: number, error: unknown): boolean {
  // A 4xx answer will not change by asking again; network blips and 5xx might.
  if (error instanceof ApiError && error.status >= 400 && error.status < 500) return false;
  return failureCount < 2;
}

export function createQueryClient(hooks: QueryClientHooks = {}): QueryClient {
  return new QueryClient({
    queryCache: new QueryCache({
      onError: (error, query) => {
        if (error instanceof ApiError && error.status === 401 && !query.meta?.session) {
          hooks.onUnauthorized?.();
          return;
        }
        if (query.meta?.errorToast === false) return;
        // One toast per query, however often a polling query fails.
        toast.error(errorMessage(error), { id: query.queryHash });
      },
    }),
    mutationCache: new MutationCache({
      onError: (error, _variables, _context, mutation) => {
        if (error instanceof ApiError && error.status === 401 && !mutation.meta?.session) {
          hooks.onUnauthorized?.();
          return;
        }
        if (mutation.meta?.errorToast === false) return;
        toast.error(errorMessage(error));
      },
    }),
    defaultOptions: {
      queries: { retry: shouldRetry, staleTime: 30_000 },
      mutations: { retry: false },
    },
  });
}
