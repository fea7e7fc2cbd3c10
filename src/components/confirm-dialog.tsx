import type { ReactNode } from 'react';
import { ApiError } from '../lib/http';
import { useT } from '../lib/i18n';
import { Button, type ButtonVariant } from './ui/button';
import { Dialog, DialogActions } from './ui/dialog';
import { Notice } from './ui/notice';

type ConfirmDialogProps = {
  open: boolean;
  title: string;
  children: ReactNode;
  confirmLabel: string;
  variant?: ButtonVariant;
  busy: boolean;
  error: unknown;
  onConfirm: () => void;
  onClose: () => void;
};

/** Asks once, in words, before a change that is easy to regret; shows the server's answer if it refuses. */
export function ConfirmDialog({
  open,
  title,
  children,
  confirmLabel,
  variant = 'primary',
  busy,
  error,
  onConfirm,
  onClose,
}: ConfirmDialogProps) {
  const t = useT();
  return (
    <Dialog open={open} onClose={onClose} title={title}>
      <div className="flex flex-col gap-3">
        {error ? (
          <Notice tone="bad" live="alert">
            {error instanceof ApiError ? error.message : t('common.wrong')}
          </Notice>
        ) : null}
        <div className="text-ink">{children}</div>
      </div>
      <DialogActions>
        <Button onClick={onClose}>{t('common.cancel')}</Button>
        <Button variant={variant} onClick={onConfirm} disabled={busy} aria-busy={busy}>
          {confirmLabel}
        </Button>
      </DialogActions>
    </Dialog>
  );
}
