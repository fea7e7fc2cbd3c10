import { useEffect, type RefObject } from 'react';

/**
 * A new part's form opens on its first reading (a box, or the Pass tile of a check), in view: the
 * operator's next touch is a reading, not a hunt for the box below the fold. Once per opening of
 * the form; a screen tall enough to show the box already is not scrolled, so the part and its
 * caution stay in view. `bar` is the sticky bar that covers the bottom of the window.
 */
export function useFirstReading(form: RefObject<HTMLFormElement | null>, bar: RefObject<HTMLElement | null>) {
  useEffect(() => {
    const first = form.current?.querySelector<HTMLInputElement>('input[data-field]:not([type="file"])');
    if (!first) return;
    first.focus({ preventScroll: true });
    const box = first.getBoundingClientRect();
    const covered = bar.current?.getBoundingClientRect().height ?? 0;
    if (box.top < 0 || box.bottom > window.innerHeight - covered) first.scrollIntoView({ block: 'center' });
  }, [form, bar]);
}
