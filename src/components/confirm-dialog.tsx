import type { ReactNode } from 'react';
import { ApiError } from '../lib/http';
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
  return (
    <Dialog open={open} onClose={onClose} title={title}>
      <div className="flex flex-col gap-3">
        {error ? (
          <Notice tone="bad" live="alert">
            {error instanceof ApiError ? error.message : 'Something went wrong. Try again.'}
          </Notice>
        ) : null}
        <div className="text-ink">{children}</div>
      </div>
      <DialogActions>
        <Button onClick={onClose}>Cancel</Button>
        <Button variant={variant} onClick={onConfirm} disabled={busy} aria-busy={busy}>
          {confirmLabel}
        </Button>
      </DialogActions>
    </Dialog>
  );
}
