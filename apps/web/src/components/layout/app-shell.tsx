import type { CurrentUser } from '@underfoot/core';
import { useId, useState, type ReactNode } from 'react';
import { Link, NavLink, useNavigate, useNavigation } from 'react-router-dom';
import { Wordmark } from '@/components/brand/wordmark';
import { Spinner } from '@/components/ui/spinner';
import { accountNavItem, mainNavigationFor } from '@/config/navigation';
import { paths } from '@/config/paths';
import { homePathOf, useSignOut } from '@/lib/auth';
import { cn } from '@/lib/cn';
import { useDemoMailboxAvailable } from '@/lib/demo-mode';
import { AccountMenu, Avatar, WhoAmI } from './account-menu';

function navLinkClass({ isActive }: { isActive: boolean }) {
  return cn(
    'inline-flex min-h-11 items-center rounded-lg px-3 font-medium no-underline',
    isActive ? 'bg-brand-soft text-brand-strong' : 'text-ink hover:bg-sand',
  );
}

/** A thin bar under the header while the next page loads. */
function PendingBar() {
  const navigation = useNavigation();
  if (navigation.state === 'idle') return null;
  return (
    <div role="progressbar" aria-label="Loading the page" className="h-0.5 w-full overflow-hidden bg-brand-soft">
      <div className="h-full w-1/3 animate-indeterminate bg-brand motion-reduce:animate-none" />
    </div>
  );
}

export function AppShell({ user, children }: { user: CurrentUser; children: ReactNode }) {
  const [menuOpen, setMenuOpen] = useState(false);
  const mobileMenuId = useId();
  const navigate = useNavigate();
  const mailboxAvailable = useDemoMailboxAvailable();
  const signOut = useSignOut({
    onSignedOut: () => {
      void navigate(paths.auth.signIn.getHref(), { replace: true });
    },
  });
  const items = mainNavigationFor(user);
  const close = () => setMenuOpen(false);

  return (
    <div className="flex min-h-dvh flex-col">
      <a href="#main" className="sr-only z-50 rounded-lg bg-sheet px-4 py-2 focus:not-sr-only focus:fixed focus:top-2 focus:left-2">
        Skip to content
      </a>
      <header className="sticky top-0 z-30 border-b border-line bg-sheet">
        <div className="mx-auto flex h-16 max-w-6xl items-center gap-2 px-4 sm:gap-6 sm:px-6">
          <Link to={homePathOf(user.role)} className="rounded-lg no-underline" aria-label="Underfoot home">
            <Wordmark />
          </Link>
          <nav aria-label="Main" className="hidden md:block">
            <ul className="flex items-center gap-1">
              {items.map((item) => (
                <li key={item.to}>
                  <NavLink to={item.to} end={item.end} className={navLinkClass}>
                    {item.label}
                  </NavLink>
                </li>
              ))}
            </ul>
          </nav>
          <div className="ml-auto hidden md:block">
            <AccountMenu
              user={user}
              mailboxAvailable={mailboxAvailable}
              signingOut={signOut.isPending}
              onSignOut={() => signOut.mutate()}
            />
          </div>
          <button
            type="button"
            className="ml-auto inline-flex min-h-11 min-w-11 items-center justify-center gap-2 rounded-lg px-2 hover:bg-sand md:hidden"
            aria-expanded={menuOpen}
            aria-controls={mobileMenuId}
            onClick={() => setMenuOpen((v) => !v)}
          >
            <Avatar name={user.name} className="size-8" />
            <svg aria-hidden="true" viewBox="0 0 24 24" className="size-6" fill="none" stroke="currentColor" strokeWidth="2">
              {menuOpen ? <path d="M6 6l12 12M18 6 6 18" /> : <path d="M4 7h16M4 12h16M4 17h16" />}
            </svg>
            <span className="sr-only">Menu</span>
          </button>
        </div>
        <div id={mobileMenuId} hidden={!menuOpen} className="border-t border-line bg-sheet md:hidden">
          <nav aria-label="Main" className="px-4 py-3">
            <ul className="space-y-1">
              {[...items, accountNavItem].map((item) => (
                <li key={item.to}>
                  <NavLink to={item.to} end={item.end} className={navLinkClass} onClick={close}>
                    {item.label}
                  </NavLink>
                </li>
              ))}
              {mailboxAvailable ? (
                <li>
                  <NavLink to={paths.mailbox.getHref()} className={navLinkClass} onClick={close}>
                    Demo mailbox
                  </NavLink>
                </li>
              ) : null}
            </ul>
          </nav>
          <div className="flex items-center gap-3 border-t border-line px-4 py-4">
            <Avatar name={user.name} />
            <WhoAmI user={user} />
          </div>
          <div className="px-4 pb-4">
            <button
              type="button"
              onClick={() => signOut.mutate()}
              disabled={signOut.isPending}
              className="inline-flex min-h-11 w-full items-center justify-center gap-2 rounded-lg border border-line-strong bg-sheet font-semibold hover:bg-sand"
            >
              {signOut.isPending ? <Spinner /> : null}
              Sign out
            </button>
          </div>
        </div>
        <PendingBar />
      </header>
      <main id="main" className="mx-auto w-full max-w-6xl flex-1 px-4 py-6 sm:px-6 sm:py-10">
        {children}
      </main>
    </div>
  );
}
