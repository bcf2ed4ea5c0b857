import { queryOptions, useQuery } from '@tanstack/react-query';
import { api, isApiError } from './api-client';

/**
 * Whether the server runs with the fake mail server, i.e. whether the demo
 * mailbox exists. The mailbox endpoint answers 404 otherwise.
 */
export function demoMailboxQueryOptions() {
  return queryOptions({
    queryKey: ['demo', 'mailbox-available'] as const,
    queryFn: async () => {
      try {
        await api.get<unknown>('/api/dev/mailbox');
        return true;
      } catch (error) {
        if (isApiError(error, 404)) return false;
        throw error;
      }
    },
    staleTime: Infinity,
    retry: false,
    meta: { errorToast: false },
  });
}

export function useDemoMailboxAvailable(): boolean {
  return useQuery(demoMailboxQueryOptions()).data === true;
}
