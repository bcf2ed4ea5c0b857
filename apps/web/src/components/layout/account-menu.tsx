import type { CurrentUser } from '@underfoot/core';
import { useEffect, useId, useRef, useState } from 'react';
import { Link } from 'react-router-dom';
import { Spinner } from '@/components/ui/spinner';
import { paths } from '@/config/paths';
import { roleLabels } from '@/config/roles';
import { cn } from '@/lib/cn';

export function initialsOf(name: string): string {
  const parts = name.trim().split(/\s+/).filter(Boolean);
  const first = parts[0]?.[0] ?? '';
  const last = parts.length > 1 ? (parts[parts.length - 1]?.[0] ?? '') : '';
  return (first + last).toUpperCase() || '?';
}

export function Avatar({ name, className }: { name: string; className?: string }) {
  return (
    <span
      aria-hidden="true"
      className={cn(
        'inline-flex size-9 shrink-0 items-center justify-center rounded-full bg-accent text-sm font-semibold text-white',
        className,
      )}
    >
      {initialsOf(name)}
    </span>
  );
}

/** Name, role and company of the signed-in person. */
export function WhoAmI({ user }: { user: CurrentUser }) {
  return (
    <div className="min-w-0">
      <p className="truncate font-semibold text-ink">{user.name}</p>
      <p className="truncate text-sm text-ink-muted">{user.email}</p>
      <p className="truncate text-sm text-ink-muted">
        {roleLabels[user.role]} · {user.companyName}
      </p>
    </div>
  );
}

/** The account menu in the header (a disclosure, so it reads well with a screen reader). */
export function AccountMenu({
  user,
  mailboxAvailable,
  onSignOut,
  signingOut,
}: {
  user: CurrentUser;
  mailboxAvailable: boolean;
  onSignOut: () => void;
  signingOut: boolean;
}) {
  const [open, setOpen] = useState(false);
  const panelId = useId();
  const rootRef = useRef<HTMLDivElement>(null);
  const buttonRef = useRef<HTMLButtonElement>(null);

  useEffect(() => {
    if (!open) return;
    function onPointerDown(event: PointerEvent) {
      if (!rootRef.current?.contains(event.target as Node)) setOpen(false);
    }
    function onKeyDown(event: KeyboardEvent) {
      if (event.key === 'Escape') {
        setOpen(false);
        buttonRef.current?.focus();
      }
    }
    document.addEventListener('pointerdown', onPointerDown);
    document.addEventListener('keydown', onKeyDown);
    return () => {
      document.removeEventListener('pointerdown', onPointerDown);
      document.removeEventListener('keydown', onKeyDown);
    };
  }, [open]);

  const itemClass = 'flex min-h-11 w-full items-center rounded-md px-3 text-left text-ink no-underline hover:bg-sand';

  return (
    <div ref={rootRef} className="relative">
      <button
        ref={buttonRef}
        type="button"
        aria-expanded={open}
        aria-controls={panelId}
        onClick={() => setOpen((v) => !v)}
        className="flex min-h-11 items-center gap-2.5 rounded-lg px-2 hover:bg-sand"
      >
        <Avatar name={user.name} />
        <span className="max-w-48 truncate text-left">
          <span className="block truncate text-sm font-semibold">{user.name}</span>
          <span className="block truncate text-xs text-ink-muted">{roleLabels[user.role]}</span>
        </span>
        <span className="sr-only">Account menu</span>
        <svg aria-hidden="true" viewBox="0 0 20 20" className="size-4 text-ink-muted" fill="currentColor">
          <path d="M5.3 7.3a1 1 0 0 1 1.4 0L10 10.6l3.3-3.3a1 1 0 1 1 1.4 1.4l-4 4a1 1 0 0 1-1.4 0l-4-4a1 1 0 0 1 0-1.4Z" />
        </svg>
      </button>
      <div
        id={panelId}
        hidden={!open}
        className="absolute right-0 z-40 mt-2 w-72 rounded-card border border-line bg-sheet p-2 shadow-sheet"
      >
        <div className="border-b border-line px-3 pt-2 pb-3">
          <WhoAmI user={user} />
        </div>
        <ul className="pt-2">
          <li>
            <Link to={paths.account.getHref()} className={itemClass} onClick={() => setOpen(false)}>
              Account
            </Link>
          </li>
          {mailboxAvailable ? (
            <li>
              <Link to={paths.mailbox.getHref()} className={itemClass} onClick={() => setOpen(false)}>
                Demo mailbox
              </Link>
            </li>
          ) : null}
          <li>
            <button type="button" className={itemClass} onClick={onSignOut} disabled={signingOut}>
              {signingOut ? <Spinner className="mr-2" /> : null}
              Sign out
            </button>
          </li>
        </ul>
      </div>
    </div>
  );
}
