import { useState, type ReactNode } from 'react';
import { useFormContext, type FieldValues } from 'react-hook-form';
import { SubmitButton } from './form';
import { TextField } from './form-fields';
import { PASSWORD_HINT } from './signing-statement';
import { Button, type ButtonSize } from './ui/button';
import { Dialog, DialogActions } from './ui/dialog';
import { Icon } from './ui/icon';
import { Notice } from './ui/notice';

type SignStepProps = {
  /** The words on the button that opens the dialog, and on the one that signs. */
  label: string;
  signer: string;
  /** What the signature means, as a sentence's end: "decide this claim". */
  meaning: string;
  /** The record signed: a claim, a unit, a corrective action. */
  subject: string;
  /** Anything else the signer should read before signing (what follows from it). */
  children?: ReactNode;
  size?: ButtonSize;
};

/**
 * The end of a signed form: the button checks everything else the form holds, then a dialog says
 * who signs, what the signature means and on which record, and asks for the password there. The
 * dialog sits inside the surrounding <Form>, so its button submits the whole form; a refusal from
 * the server is shown in the dialog as well as above the form. Once the signature is accepted the
 * dialog closes, so a form that stays on the page (the next sign-off) shows its outcome.
 */
export function SignStep({ label, signer, meaning, subject, children, size = 'lg' }: SignStepProps) {
  const { trigger, getValues, formState } = useFormContext<FieldValues>();
  // the submit count when the dialog opened: a successful submit since then closes it
  const [openedAt, setOpenedAt] = useState<number | null>(null);
  const refused = formState.errors.root?.server?.message;
  const { isSubmitSuccessful, submitCount } = formState;
  const open = openedAt !== null && !(isSubmitSuccessful && submitCount > openedAt);
  const setOpen = (to: boolean) => setOpenedAt(to ? submitCount : null);

  const check = async () => {
    const rest = Object.keys(getValues()).filter((k) => k !== 'password');
    if (await trigger(rest, { shouldFocus: true })) setOpen(true);
  };

  return (
    <>
      <div className="flex justify-end">
        <Button variant="primary" size={size} icon="key" onClick={() => void check()}>
          {label}…
        </Button>
      </div>
      <Dialog
        open={open}
        onClose={() => setOpen(false)}
        width="wide"
        title={label}
        description="Your password signs it. The signature keeps your name, its meaning and the time."
      >
        <div className="flex flex-col gap-4">
          <section
            aria-label="What you are signing"
            className="rounded-control border border-rule-strong bg-sunk px-4 py-3"
          >
            <p className="mb-2 flex items-center gap-1.5 font-semibold">
              <Icon name="key" size={18} className="text-accent" />
              What you are signing
            </p>
            <dl className="grid grid-cols-1 gap-x-3 gap-y-1.5 sm:grid-cols-[8.5rem_minmax(0,1fr)]">
              <dt className="text-sm text-ink-soft">Printed name</dt>
              <dd className="font-semibold">{signer}</dd>
              <dt className="text-sm text-ink-soft">Meaning</dt>
              <dd>
                You {meaning} on <span className="font-mono font-semibold">{subject}</span>.
              </dd>
              <dt className="text-sm text-ink-soft">Time</dt>
              <dd>The moment you sign, by the server’s clock.</dd>
            </dl>
            {children && <div className="mt-2 border-t border-rule pt-2 text-ink">{children}</div>}
          </section>
          {refused && (
            <Notice tone="bad" live="alert">
              {refused}
            </Notice>
          )}
          <div className="max-w-sm">
            <TextField
              name="password"
              label="Password"
              type="password"
              autoComplete="current-password"
              autoFocus
              hint={PASSWORD_HINT}
            />
          </div>
        </div>
        <DialogActions>
          <Button onClick={() => setOpen(false)}>Cancel</Button>
          <SubmitButton size={size === 'sm' ? 'md' : size}>{label}</SubmitButton>
        </DialogActions>
      </Dialog>
    </>
  );
}
