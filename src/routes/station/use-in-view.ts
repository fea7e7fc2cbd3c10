import { useEffect, useState, type RefObject } from 'react';

/**
 * Whether any of an element is on screen, above a strip of `coveredBottom` pixels that something
 * sticky covers. True until the browser says otherwise, and when there is no element to watch.
 */
export function useInView(ref: RefObject<HTMLElement | null> | undefined, coveredBottom = 0) {
  const [inView, setInView] = useState(true);
  useEffect(() => {
    const el = ref?.current;
    if (!el || typeof IntersectionObserver === 'undefined') return;
    const seen = new IntersectionObserver(([entry]) => setInView(entry?.isIntersecting ?? true), {
      rootMargin: `0px 0px -${coveredBottom}px 0px`,
    });
    seen.observe(el);
    return () => seen.disconnect();
  }, [ref, coveredBottom]);
  return inView;
}
