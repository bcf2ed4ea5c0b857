import { useSearchParams } from 'react-router-dom';

/**
 * A list's filters, sort and page kept in the address, so Back and a shared link
 * show the same list. `update` sets or (with null or '') removes parameters and
 * replaces the history entry; any change that does not name the page starts
 * again at the first page.
 */
export function useListParams() {
  const [params, setParams] = useSearchParams();
  const update = (changes: Record<string, string | null>) =>
    setParams(
      (prev) => {
        const next = new URLSearchParams(prev);
        for (const [key, value] of Object.entries(changes)) {
          if (value === null || value === '') next.delete(key);
          else next.set(key, value);
        }
        if (!('page' in changes)) next.delete('page');
        return next;
      },
      { replace: true },
    );
  return { params, update };
}

/** The page number from the address: 0-based, 0 when missing or not a number. */
export function pageParam(params: URLSearchParams): number {
  return Math.max(0, Number.parseInt(params.get('page') ?? '0', 10) || 0);
}
