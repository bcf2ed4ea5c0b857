import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';
import { Wordmark } from '@/components/brand/wordmark';
import { paths } from '@/config/paths';
import { cn } from '@/lib/cn';

/** A page with only the wordmark above it: for error pages and the demo mailbox. */
export function SimpleLayout({ children, headerEnd, wide = false }: { children: ReactNode; headerEnd?: ReactNode; wide?: boolean }) {
  return (
    <div className="flex min-h-dvh flex-col">
      <header className="border-b border-line bg-sheet">
        <div className={cn('mx-auto flex h-16 items-center gap-4 px-4 sm:px-6', wide ? 'max-w-7xl' : 'max-w-3xl')}>
          <Link to={paths.home.getHref()} className="rounded-lg no-underline" aria-label="Underfoot home">
            <Wordmark />
          </Link>
          {headerEnd ? <div className="ml-auto flex items-center gap-2">{headerEnd}</div> : null}
        </div>
      </header>
      <main id="main" className={cn('mx-auto w-full flex-1 px-4 py-8 sm:px-6 sm:py-12', wide ? 'max-w-7xl' : 'max-w-3xl')}>
        {children}
      </main>
    </div>
  );
}
