import { useEffect, useEffectEvent, useState } from 'react';

/** Wait this long after the last keystroke before searching, so each letter is not a request. */
export const SEARCH_DEBOUNCE_MS = 300;

/**
 * The text of a search box, handed to `onSearch` (trimmed; '' once emptied) when
 * typing pauses and it differs from `current`, the search in force now.
 */
export function useDebouncedSearch(current: string, onSearch: (text: string) => void) {
  const [text, setText] = useState(current);
  const search = useEffectEvent(onSearch);

  useEffect(() => {
    const trimmed = text.trim();
    if (trimmed === current) return;
    const timer = setTimeout(() => search(trimmed), SEARCH_DEBOUNCE_MS);
    return () => clearTimeout(timer);
  }, [text, current]);

  return [text, setText] as const;
}
