import { useQuery } from '@tanstack/react-query';
import { Alert } from '@/components/ui/alert';
import { Card } from '@/components/ui/card';
import { SectionLoading } from '@/components/ui/spinner';
import { errorMessage } from '@/lib/api-client';
import { formatDateTime } from '@/lib/format';
import { mailboxMessageQueryOptions } from '../api';
import { LinkifiedText } from './linkified-text';

/**
 * Links in a mail should open in the app itself, not inside the frame: a
 * `<base target="_top">` makes every link leave the sandbox on a click.
 */
export function withTopLevelLinks(html: string): string {
  const base = '<base target="_top">';
  const head = /<head(\s[^>]*)?>/i;
  if (head.test(html)) return html.replace(head, (tag) => `${tag}${base}`);
  return `${base}${html}`;
}

export function MessageView({ id }: { id: string }) {
  const message = useQuery(mailboxMessageQueryOptions(id));

  if (message.isPending) return <SectionLoading label="Opening the message…" />;
  if (message.isError) {
    return (
      <Alert tone="danger" title="This message could not be opened">
        {errorMessage(message.error)}
      </Alert>
    );
  }

  const { data } = message;
  const to = Array.isArray(data.to) ? data.to.join(', ') : data.to;

  return (
    <Card className="overflow-hidden">
      <div className="border-b border-line px-5 py-4">
        <h2 className="text-xl font-semibold break-words">{data.subject || '(no subject)'}</h2>
        <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5 text-sm">
          <dt className="text-ink-muted">From</dt>
          <dd className="break-all">{data.from}</dd>
          <dt className="text-ink-muted">To</dt>
          <dd className="break-all">{to}</dd>
          <dt className="text-ink-muted">Sent</dt>
          <dd className="numeric">
            <time dateTime={data.date}>{formatDateTime(data.date)}</time>
          </dd>
        </dl>
      </div>
      {data.html ? (
        <section aria-label="Formatted message" className="border-b border-line bg-white">
          <iframe
            title={`Formatted message: ${data.subject}`}
            // No scripts, no same-origin access: only links a person clicks may leave the frame.
            sandbox="allow-popups allow-top-navigation-by-user-activation"
            srcDoc={withTopLevelLinks(data.html)}
            className="block h-[28rem] w-full"
          />
        </section>
      ) : null}
      <section aria-labelledby="plain-text-heading" className="px-5 py-4">
        <h3 id="plain-text-heading" className="text-sm font-semibold text-ink-muted">
          Plain-text version
        </h3>
        {data.text ? (
          <pre className="mt-2 font-sans text-sm leading-6 break-words whitespace-pre-wrap">
            <LinkifiedText text={data.text} />
          </pre>
        ) : (
          <p className="mt-2 text-sm text-ink-muted">This message has no plain-text part.</p>
        )}
      </section>
    </Card>
  );
}
