import { Link } from 'react-router-dom';
import { paths } from '@/config/paths';
import { cn } from '@/lib/cn';
import { formatDateTime } from '@/lib/format';
import type { MailboxMessageSummary } from '../api';

export function MessageList({ messages, selectedId }: { messages: readonly MailboxMessageSummary[]; selectedId: string | null }) {
  return (
    <ul className="divide-y divide-line overflow-hidden rounded-card border border-line bg-sheet">
      {messages.map((message) => {
        const selected = message.id === selectedId;
        return (
          <li key={message.id}>
            <Link
              to={paths.mailbox.getHref(message.id)}
              aria-current={selected ? 'true' : undefined}
              className={cn('block px-4 py-3 text-ink no-underline', selected ? 'bg-brand-soft' : 'hover:bg-sand')}
            >
              <span className="block truncate font-semibold">{message.subject || '(no subject)'}</span>
              <span className="block truncate text-sm text-ink-muted">To {message.to.join(', ')}</span>
              <span className="numeric block text-sm text-ink-muted">
                <time dateTime={message.date}>{formatDateTime(message.date)}</time>
              </span>
            </Link>
          </li>
        );
      })}
    </ul>
  );
}
