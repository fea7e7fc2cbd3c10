import { useEffect, useRef, useState } from 'react';
import { useLocation, useNavigation, useSearchParams } from 'react-router';

/**
 * The address we last asked for, while the router is still loading it. Two quick changes (a
 * family chosen right after typing, "to" filled right after "from") each build on the one before,
 * even before the first has reached the address bar. Cleared once the router is idle again.
 */
let requested: { path: string; search: string } | null = null;

/** The newest filters: the ones asked for and still loading, else the address as it is now. */
function latestParams(): URLSearchParams {
  const here = window.location.pathname;
  if (requested && requested.path === here) return new URLSearchParams(requested.search);
  return new URLSearchParams(window.location.search);
}

/**
 * A list's filters live in the address (bookmarkable, back-button safe). Changing a filter goes
 * back to page 1 and replaces the history entry; moving between pages adds one. Every change is
 * made to the newest address, never to the one this component last rendered with, so a change
 * made from a timer (the debounced search) cannot undo another made meanwhile.
 */
export function useUrlFilter() {
  const [params, setParams] = useSearchParams();
  const navigation = useNavigation();
  const location = useLocation();
  useEffect(() => {
    if (navigation.state === 'idle') requested = null;
  }, [navigation.state, location.key]);
  const setMany = (changes: Record<string, string>) => {
    const next = latestParams();
    for (const [key, value] of Object.entries(changes)) {
      if (value) next.set(key, value);
      else next.delete(key);
    }
    if (!('page' in changes)) next.delete('page');
    requested = { path: window.location.pathname, search: next.toString() };
    setParams(() => next, { replace: !('page' in changes) });
  };
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
  // the newest commit, so the timer never runs one captured from an older render
  const latestCommit = useRef(commit);
  useEffect(() => {
    latestCommit.current = commit;
  });
  useEffect(() => {
    const t = timer;
    return () => window.clearTimeout(t.current);
  }, []);
  const onChange = (v: string) => {
    setDraft(v);
    window.clearTimeout(timer.current);
    timer.current = window.setTimeout(() => latestCommit.current(v.trim()), delay);
  };
  return [draft, onChange] as const;
}
