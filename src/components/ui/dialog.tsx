import { useEffect, useId, useRef, type ReactNode } from 'react';
import { useT } from '../../lib/i18n';
import { Icon } from './icon';

type DialogProps = {
  open: boolean;
  onClose: () => void;
  title: ReactNode;
  description?: ReactNode;
  children: ReactNode;
  width?: 'narrow' | 'wide';
};

/**
 * The native <dialog> in modal mode: it traps focus, closes on Escape and makes the page behind it
 * inert without any script of ours. Content mounts only while open, so every opening starts clean.
 */
export function Dialog({ open, onClose, title, description, children, width = 'narrow' }: DialogProps) {
  const t = useT();
  const ref = useRef<HTMLDialogElement>(null);
  const titleId = useId();
  const descId = useId();

  useEffect(() => {
    const el = ref.current;
    if (!el) return;
    if (open && !el.open) el.showModal();
    if (!open && el.open) el.close();
  }, [open]);

  return (
    <dialog
      ref={ref}
      aria-labelledby={titleId}
      aria-describedby={description ? descId : undefined}
      onClose={onClose}
      className={`m-auto w-[calc(100%-2rem)] rounded-card border border-rule-strong bg-card p-0 text-ink shadow-xl backdrop:bg-ink/45 ${width === 'wide' ? 'max-w-2xl' : 'max-w-lg'}`}
    >
      {open && (
        <div>
          <header className="flex items-start justify-between gap-4 border-b border-rule px-5 py-3.5">
            <div>
              <h2 id={titleId} className="text-lg font-semibold">
                {title}
              </h2>
              {description && (
                <p id={descId} className="mt-0.5 text-sm text-ink-soft">
                  {description}
                </p>
              )}
            </div>
            <button
              type="button"
              onClick={onClose}
              aria-label={t('common.close')}
              className="-mr-1 inline-flex size-9 items-center justify-center rounded-control text-ink-soft hover:bg-sunk floor:size-12"
            >
              <Icon name="close" size={20} />
            </button>
          </header>
          <div className="px-5 py-4">{children}</div>
        </div>
      )}
    </dialog>
  );
}

/** Buttons at the foot of a dialog: the way out on the left, the action on the right. */
export function DialogActions({ children }: { children: ReactNode }) {
  return <div className="mt-5 flex flex-wrap items-center justify-end gap-2 border-t border-rule pt-4">{children}</div>;
}
