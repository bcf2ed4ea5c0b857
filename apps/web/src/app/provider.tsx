import { QueryClientProvider } from '@tanstack/react-query';
import { useState, type CSSProperties } from 'react';
import { RouterProvider } from 'react-router-dom';
import { Toaster } from 'sonner';
import { sessionKeys } from '@/lib/auth';
import { createQueryClient } from '@/lib/query-client';
import { createAppRouter } from './router';

// Sonner reads its colours from these variables; ours come from the theme.
const toasterTheme = {
  fontFamily: 'var(--font-sans)',
  '--normal-bg': 'var(--color-sheet)',
  '--normal-text': 'var(--color-ink)',
  '--normal-border': 'var(--color-line)',
  '--error-bg': 'var(--color-danger-soft)',
  '--error-text': 'var(--color-danger)',
  '--error-border': 'var(--color-danger)',
  '--success-bg': 'var(--color-success-soft)',
  '--success-text': 'var(--color-success)',
  '--success-border': 'var(--color-success)',
  '--info-bg': 'var(--color-accent-soft)',
  '--info-text': 'var(--color-accent-strong)',
  '--info-border': 'var(--color-accent)',
} as CSSProperties;

export type AppParts = ReturnType<typeof createApp>;

export function createApp() {
  // The query client and the router need each other: a 401 anywhere re-runs the guards.
  const queryClient = createQueryClient({
    onUnauthorized: () => {
      queryClient.setQueryData(sessionKeys.me, null);
      void router.revalidate();
    },
  });
  const router = createAppRouter(queryClient);
  return { queryClient, router };
}

/**
 * Resolves once the router has run the first page's loaders, so the first render is the page
 * itself rather than a loading screen (used when the server sent a first view to keep on screen).
 */
export function whenRouterReady({ router }: AppParts): Promise<void> {
  if (router.state.initialized) return Promise.resolve();
  return new Promise((resolve) => {
    const stop = router.subscribe((state) => {
      if (!state.initialized) return;
      stop();
      resolve();
    });
  });
}

export function App({ parts }: { parts?: AppParts }) {
  const [{ queryClient, router }] = useState(() => parts ?? createApp());
  return (
    <QueryClientProvider client={queryClient}>
      <RouterProvider router={router} />
      <Toaster position="top-center" closeButton richColors style={toasterTheme} />
    </QueryClientProvider>
  );
}
