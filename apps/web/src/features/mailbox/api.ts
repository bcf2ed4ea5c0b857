import { queryOptions } from '@tanstack/react-query';
import { api, isApiError } from '@/lib/api-client';

export interface MailboxMessageSummary {
  id: string;
  from: string;
  to: string[];
  subject: string;
  /** ISO 8601. */
  date: string;
}

export interface MailboxMessage {
  id: string;
  from: string;
  to: string[] | string;
  subject: string;
  date: string;
  text: string | null;
  html: string | null;
}

/** How often the list asks for new mail while the page is open. */
export const MAILBOX_POLL_MS = 4000;

export const mailboxKeys = {
  all: ['mailbox'] as const,
  list: () => [...mailboxKeys.all, 'list'] as const,
  message: (id: string) => [...mailboxKeys.all, 'message', id] as const,
};

export function mailboxQueryOptions() {
  return queryOptions({
    queryKey: mailboxKeys.list(),
    queryFn: ({ signal }) => api.get<{ messages: MailboxMessageSummary[] }>('/api/dev/mailbox', { signal }).then((body) => body.messages),
    // 404 means the server is not in demo mode: stop asking.
    refetchInterval: (query) => (isApiError(query.state.error, 404) ? false : MAILBOX_POLL_MS),
    staleTime: 0,
    meta: { errorToast: false },
  });
}

export function mailboxMessageQueryOptions(id: string) {
  return queryOptions({
    queryKey: mailboxKeys.message(id),
    queryFn: ({ signal }) => api.get<MailboxMessage>(`/api/dev/mailbox/${encodeURIComponent(id)}`, { signal }),
    // A caught message never changes.
    staleTime: Infinity,
    meta: { errorToast: false },
  });
}
