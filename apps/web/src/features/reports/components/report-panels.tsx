import { useQuery } from '@tanstack/react-query';
import { otherSide, partyRoleLabels, type OrderKind, type Side } from '@underfoot/core';
import { useId, useState, type FormEvent, type ReactNode } from 'react';
import { toast } from 'sonner';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Spinner } from '@/components/ui/spinner';
import { inputClasses } from '@/components/ui/text-field';
import { roleLabels } from '@/config/roles';
import { errorMessage, isApiError } from '@/lib/api-client';
import { cn } from '@/lib/cn';
import { formatDateTime } from '@/lib/format';
import {
  questionsQueryOptions,
  shareLinksQueryOptions,
  useAnswer,
  useAsk,
  useCreateShareLink,
  useDisclosure,
  useRevokeShareLink,
  viewsQueryOptions,
  type Message,
  type ReportAllowed,
} from '../api';

export function Panel({ id, title, description, children }: { id: string; title: string; description?: ReactNode; children: ReactNode }) {
  return (
    <section
      id={id}
      aria-labelledby={`${id}-title`}
      className="scroll-mt-20 rounded-card border border-line bg-sheet p-4 shadow-sheet sm:p-5"
    >
      <h2 id={`${id}-title`} className="text-lg font-semibold">
        {title}
      </h2>
      {description ? <div className="mt-1 text-sm text-ink-muted">{description}</div> : null}
      <div className="mt-3">{children}</div>
    </section>
  );
}

const sideNames: Record<Side, string> = { buyer: 'buyer', seller: 'seller' };

/** The ordering side shares the report with the other side of the sale, or takes it back. */
export function DisclosurePanel({ orderId, orderingSide, allowed }: { orderId: string; orderingSide: Side; allowed: ReportAllowed }) {
  const mutation = useDisclosure(orderId);
  const other = otherSide(orderingSide);
  if (!allowed.disclose && !allowed.withdraw) return null;
  return (
    <Panel
      id="disclosure"
      title={`Share with the ${sideNames[other]}’s side`}
      description={
        allowed.withdraw
          ? `The ${sideNames[other]} and their agent can read this report. Withdrawing stops that; what they already saw or downloaded stays with them.`
          : `The report is yours until you share it. Sharing lets the ${sideNames[other]} and their agent read it, and e-mails them.`
      }
    >
      {allowed.withdraw ? (
        <p className="mb-3 flex items-center gap-2 font-semibold text-success">
          <svg aria-hidden="true" viewBox="0 0 16 16" className="size-4" fill="none" stroke="currentColor" strokeWidth="2">
            <path d="m3 8.5 3 3L13 4.5" />
          </svg>
          Shared with the {sideNames[other]}’s side
        </p>
      ) : null}
      <Button
        variant={allowed.withdraw ? 'secondary' : 'primary'}
        className="w-full"
        pending={mutation.isPending}
        onClick={() =>
          mutation.mutate(!allowed.withdraw, {
            onSuccess: () => toast.success(allowed.withdraw ? 'Sharing withdrawn.' : `Shared with the ${sideNames[other]}’s side.`),
          })
        }
      >
        {allowed.withdraw ? 'Withdraw sharing' : `Share with the ${sideNames[other]}’s side`}
      </Button>
    </Panel>
  );
}

const expiryChoices = [
  { days: 7, label: '7 days' },
  { days: 30, label: '30 days' },
  { days: 90, label: '90 days' },
];

async function copy(text: string) {
  try {
    await navigator.clipboard.writeText(text);
    toast.success('Link copied.');
  } catch {
    toast.error('Could not copy. Select the link and copy it by hand.');
  }
}

/** Links for a lender, an insurer or a contractor: expiring, revocable, with or without costs. */
export function ShareLinksPanel({ orderId, orderKind, allowed }: { orderId: string; orderKind: OrderKind; allowed: ReportAllowed }) {
  const links = useQuery({ ...shareLinksQueryOptions(orderId), enabled: allowed.share });
  const create = useCreateShareLink(orderId);
  const revoke = useRevokeShareLink(orderId);
  const [label, setLabel] = useState('');
  const [days, setDays] = useState(30);
  const [showCosts, setShowCosts] = useState(true);
  const [made, setMade] = useState<{ url: string; label: string } | null>(null);
  const labelId = useId();
  const expiryId = useId();
  if (!allowed.share) return null;

  const submit = (event: FormEvent, purpose: 'guest' | 'disclosure') => {
    event.preventDefault();
    create.mutate(
      {
        purpose,
        label: purpose === 'disclosure' ? label || 'Listing disclosure' : label,
        expiresInDays: purpose === 'disclosure' ? null : days,
        showCosts,
      },
      {
        onSuccess: (body) => {
          setMade({ url: body.url, label: label || (purpose === 'disclosure' ? 'Listing disclosure' : 'Share link') });
          setLabel('');
        },
      },
    );
  };
  const labelError =
    create.error && isApiError(create.error, 400) ? create.error.fieldErrors.find((e) => e.path === 'label')?.message : undefined;

  return (
    <Panel
      id="share-links"
      title="Share links"
      description="For a lender, an insurer or a repair contractor: a link that opens this report without an account, until it expires or you revoke it."
    >
      <form onSubmit={(e) => submit(e, 'guest')} className="space-y-3">
        <div className="space-y-1.5">
          <label htmlFor={labelId} className="block text-sm font-semibold">
            Who is it for?
          </label>
          <input
            id={labelId}
            className={inputClasses}
            value={label}
            maxLength={120}
            placeholder="e.g. Lender, Alder Falls Credit Union"
            onChange={(e) => setLabel(e.target.value)}
            aria-invalid={labelError ? true : undefined}
          />
          {labelError ? <p className="text-sm font-medium text-danger">{labelError}</p> : null}
        </div>
        <div className="flex flex-wrap gap-3">
          <div className="space-y-1.5">
            <label htmlFor={expiryId} className="block text-sm font-semibold">
              Works for
            </label>
            <select id={expiryId} className={cn(inputClasses, 'w-auto')} value={days} onChange={(e) => setDays(Number(e.target.value))}>
              {expiryChoices.map((c) => (
                <option key={c.days} value={c.days}>
                  {c.label}
                </option>
              ))}
            </select>
          </div>
          <label className="flex min-h-11 items-center gap-2 self-end text-sm">
            <input type="checkbox" className="size-5 accent-brand" checked={showCosts} onChange={(e) => setShowCosts(e.target.checked)} />
            Include cost ranges
          </label>
        </div>
        {create.error && !labelError ? <Alert tone="danger">{errorMessage(create.error)}</Alert> : null}
        <div className="flex flex-wrap gap-2">
          <Button type="submit" pending={create.isPending && create.variables?.purpose === 'guest'}>
            Make a link
          </Button>
          {allowed.disclosureLink && orderKind === 'pre_listing' ? (
            <Button
              type="button"
              variant="secondary"
              pending={create.isPending && create.variables?.purpose === 'disclosure'}
              onClick={(e) => submit(e, 'disclosure')}
            >
              Make a listing disclosure link
            </Button>
          ) : null}
        </div>
      </form>

      {made ? (
        <div className="mt-4 rounded-lg border border-success/40 bg-success-soft p-3" role="status">
          <p className="text-sm font-semibold text-success">Link for {made.label} is ready. Copy it now: it is shown only once.</p>
          <div className="mt-2 flex gap-2">
            <input
              readOnly
              value={made.url}
              aria-label="The new link"
              className={cn(inputClasses, 'min-w-0 flex-1 text-sm')}
              onFocus={(e) => e.currentTarget.select()}
            />
            <Button variant="secondary" onClick={() => void copy(made.url)}>
              Copy
            </Button>
          </div>
        </div>
      ) : null}

      <h3 className="mt-5 text-sm font-semibold">Links made</h3>
      {links.isPending ? (
        <Spinner className="mt-2 text-ink-muted" label="Loading links…" />
      ) : links.isError ? (
        <p className="mt-1 text-sm text-danger">{errorMessage(links.error)}</p>
      ) : links.data.length === 0 ? (
        <p className="mt-1 text-sm text-ink-muted">No links yet.</p>
      ) : (
        <ul className="mt-1 divide-y divide-line">
          {links.data.map((link) => (
            <li key={link.id} className="flex flex-wrap items-center justify-between gap-2 py-2.5">
              <div className="min-w-0">
                <p className="font-semibold break-words">
                  {link.label || (link.purpose === 'disclosure' ? 'Listing disclosure' : 'Share link')}
                  {!link.showCosts ? <span className="ml-1 text-sm font-normal text-ink-muted">· without costs</span> : null}
                </p>
                <p className="numeric text-sm text-ink-muted">
                  {link.revokedAt
                    ? `Revoked ${formatDateTime(link.revokedAt)}`
                    : !link.active
                      ? `Expired ${link.expiresAt ? formatDateTime(link.expiresAt) : ''}`
                      : link.expiresAt
                        ? `Works until ${formatDateTime(link.expiresAt)}`
                        : 'Does not expire'}
                  {' · '}
                  {link.views === 1 ? 'opened once' : `opened ${link.views} times`}
                </p>
              </div>
              {link.active ? (
                <Button
                  size="sm"
                  variant="secondary"
                  pending={revoke.isPending && revoke.variables === link.id}
                  onClick={() => revoke.mutate(link.id)}
                >
                  Revoke<span className="sr-only"> the link for {link.label || 'this person'}</span>
                </Button>
              ) : null}
            </li>
          ))}
        </ul>
      )}
    </Panel>
  );
}

/** Who opened the report and when: for the ordering agent and the office. */
export function ViewsPanel({ orderId }: { orderId: string }) {
  const views = useQuery(viewsQueryOptions(orderId));
  return (
    <Panel id="views" title="Who opened it" description="Every time someone opens the report or downloads the PDF.">
      {views.isPending ? (
        <Spinner className="text-ink-muted" label="Loading…" />
      ) : views.isError ? (
        <p className="text-sm text-danger">{errorMessage(views.error)}</p>
      ) : views.data.length === 0 ? (
        <p className="text-sm text-ink-muted">Nobody has opened it yet.</p>
      ) : (
        <ul className="max-h-80 divide-y divide-line overflow-y-auto text-sm">
          {views.data.slice(0, 100).map((v, i) => (
            <li key={`${v.at}-${i}`} className="flex flex-wrap justify-between gap-x-3 py-2">
              <span className="min-w-0">
                <span className="font-semibold">{v.who}</span>
                <span className="text-ink-muted">
                  {' · '}
                  {v.partyRole
                    ? partyRoleLabels[v.partyRole]
                    : v.role === 'guest'
                      ? 'no account'
                      : (roleLabels[v.role as keyof typeof roleLabels] ?? v.role)}
                </span>
                <span className="block text-ink-muted">
                  {v.what === 'pdf' ? 'Downloaded the PDF' : 'Opened the report'}
                  {v.revision > 1 ? ` (revision ${v.revision})` : ''}
                </span>
              </span>
              <span className="numeric text-ink-muted">{formatDateTime(v.at)}</span>
            </li>
          ))}
        </ul>
      )}
    </Panel>
  );
}

function Byline({ message }: { message: Message }) {
  const who = message.author.partyRole
    ? partyRoleLabels[message.author.partyRole]
    : message.author.role
      ? roleLabels[message.author.role as keyof typeof roleLabels]
      : null;
  return (
    <p className="text-sm text-ink-muted">
      <span className="font-semibold text-ink">{message.author.name}</span>
      {who ? ` · ${who}` : ''} · <span className="numeric">{formatDateTime(message.at)}</span>
    </p>
  );
}

function MessageForm({
  label,
  submitLabel,
  pending,
  error,
  onSubmit,
}: {
  label: string;
  submitLabel: string;
  pending: boolean;
  error: unknown;
  onSubmit: (body: string, reset: () => void) => void;
}) {
  const [body, setBody] = useState('');
  const id = useId();
  const fieldError = isApiError(error, 400) ? (error.fieldErrors.find((e) => e.path === 'body')?.message ?? error.detail) : undefined;
  return (
    <form
      onSubmit={(e) => {
        e.preventDefault();
        onSubmit(body, () => setBody(''));
      }}
      className="space-y-2"
    >
      <label htmlFor={id} className="block text-sm font-semibold">
        {label}
      </label>
      <textarea
        id={id}
        value={body}
        rows={3}
        maxLength={2000}
        onChange={(e) => setBody(e.target.value)}
        aria-invalid={fieldError ? true : undefined}
        aria-describedby={fieldError ? `${id}-error` : undefined}
        className={cn(inputClasses, 'min-h-24')}
      />
      {fieldError ? (
        <p id={`${id}-error`} className="text-sm font-medium text-danger">
          {fieldError}
        </p>
      ) : error ? (
        <p className="text-sm font-medium text-danger">{errorMessage(error)}</p>
      ) : null}
      <Button type="submit" size="sm" pending={pending}>
        {submitLabel}
      </Button>
    </form>
  );
}

/** Questions from the parties, answers from the inspector or the office: part of the portal, not of the frozen report. */
export function QuestionsPanel({ orderId, allowed }: { orderId: string; allowed: Pick<ReportAllowed, 'ask' | 'answer'> }) {
  const questions = useQuery(questionsQueryOptions(orderId));
  const ask = useAsk(orderId);
  const answer = useAnswer(orderId);
  const [answering, setAnswering] = useState<string | null>(null);
  return (
    <Panel
      id="questions"
      title="Questions"
      description={
        allowed.ask
          ? 'Ask the inspector about anything in the report. You get the answer here and by e-mail.'
          : 'Questions from the people on this order.'
      }
    >
      {questions.isPending ? (
        <Spinner className="text-ink-muted" label="Loading questions…" />
      ) : questions.isError ? (
        <p className="text-sm text-danger">{errorMessage(questions.error)}</p>
      ) : questions.data.length === 0 ? (
        <p className="text-sm text-ink-muted">No questions yet.</p>
      ) : (
        <ol className="space-y-4">
          {questions.data.map((q) => (
            <li key={q.id} className="rounded-lg border border-line p-3">
              <Byline message={q} />
              <p className="mt-1 whitespace-pre-line">{q.body}</p>
              {q.answers.map((a) => (
                <div key={a.id} className="mt-3 border-l-4 border-accent/40 pl-3">
                  <Byline message={a} />
                  <p className="mt-1 whitespace-pre-line">{a.body}</p>
                </div>
              ))}
              {q.answers.length === 0 && !allowed.answer ? <p className="mt-2 text-sm text-ink-muted">Waiting for an answer.</p> : null}
              {allowed.answer ? (
                answering === q.id ? (
                  <div className="mt-3">
                    <MessageForm
                      label="Your answer"
                      submitLabel="Send the answer"
                      pending={answer.isPending}
                      error={answer.error}
                      onSubmit={(body, reset) =>
                        answer.mutate(
                          { questionId: q.id, body },
                          {
                            onSuccess: () => {
                              reset();
                              setAnswering(null);
                              toast.success('Answer sent.');
                            },
                          },
                        )
                      }
                    />
                  </div>
                ) : (
                  <Button size="sm" variant="quiet" className="mt-2" onClick={() => setAnswering(q.id)}>
                    {q.answers.length ? 'Add to the answer' : 'Answer'}
                  </Button>
                )
              ) : null}
            </li>
          ))}
        </ol>
      )}
      {allowed.ask ? (
        <div className="mt-4 border-t border-line pt-4">
          <MessageForm
            label="Your question"
            submitLabel="Send the question"
            pending={ask.isPending}
            error={ask.error}
            onSubmit={(body, reset) =>
              ask.mutate(body, {
                onSuccess: () => {
                  reset();
                  toast.success('Question sent. The inspector will answer here and by e-mail.');
                },
              })
            }
          />
        </div>
      ) : null}
    </Panel>
  );
}
