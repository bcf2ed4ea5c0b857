import { useEffect } from 'react';

/** Sets the browser tab's title for the current page ("Sign in · Underfoot"). */
export function useDocumentTitle(title: string): void {
  useEffect(() => {
    document.title = title ? `${title} · Underfoot` : 'Underfoot';
  }, [title]);
}
