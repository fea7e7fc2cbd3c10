import { useEffect, useRef, useState } from 'react';
import { useSearchParams } from 'react-router';

/**
 * A list's filters live in the address (bookmarkable, back-button safe). Changing a filter goes
 * back to page 1 and replaces the history entry; moving between pages adds one.
 */
export function useUrlFilter() {
  const [params, setParams] = useSearchParams();
  const setMany = (changes: Record<string, string>) =>
    setParams(
      (prev) => {
        const next = new URLSearchParams(prev);
        for (const [key, value] of Object.entries(changes)) {
          if (value) next.set(key, value);
          else next.delete(key);
        }
        if (!('page' in changes)) next.delete('page');
        return next;
      },
      { replace: !('page' in changes) },
    );
  const set = (key: string, value: string) => setMany({ [key]: value });
  return { params, set, setMany };
}

/** A text box that commits to the address a moment after typing stops, and follows the address back. */
export function useDebouncedText(value: string, commit: (v: string) => void, delay = 300) {
  const [draft, setDraft] = useState(value);
  const [seen, setSeen] = useState(value);
  if (value !== seen) {
    setSeen(value);
    // the address changed from elsewhere (back button, a link), unless it is our own trimmed text
    if (value !== draft.trim()) setDraft(value);
  }
  const timer = useRef<number | undefined>(undefined);
  useEffect(() => {
    const t = timer;
    return () => window.clearTimeout(t.current);
  }, []);
  const onChange = (v: string) => {
    setDraft(v);
    window.clearTimeout(timer.current);
    timer.current = window.setTimeout(() => commit(v.trim()), delay);
  };
  return [draft, onChange] as const;
}
