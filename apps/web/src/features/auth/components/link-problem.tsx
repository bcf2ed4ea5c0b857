import type { ReactNode } from 'react';
import { Alert } from '@/components/ui/alert';

/** What a page shows when the link that led to it cannot be used. */
export function LinkProblem({ title, children, action }: { title: string; children: ReactNode; action?: ReactNode }) {
  return (
    <div className="space-y-5">
      <Alert tone="caution" title={title} role="alert">
        {children}
      </Alert>
      {action}
    </div>
  );
}
