import type { ReactNode } from 'react';
import { useWatch } from 'react-hook-form';
import { z } from 'zod';
import { approveChangeBody, type ApproveChangeBody } from '../../../../shared/schemas/process';
import { Form } from '../../../components/form';
import { TextAreaField, TextField } from '../../../components/form-fields';
import { SignStep } from '../../../components/sign-dialog';
import { formatWhen } from '../../../lib/format';
import { localToIso, offsetOf } from '../../../lib/local-time';

/** The shared rules for the reason and the password; the time is typed locally and converted on sending. */
const signForm = z.strictObject({
  reason: approveChangeBody.shape.reason,
  password: approveChangeBody.shape.password,
  effectiveFrom: z
    .string()
    .optional()
    .refine((v) => !v || localToIso(v) !== null, 'Enter a date and time, or leave it blank for now.'),
});

/** The reason and the time as typed, repeated in the signing dialog so the signer reads what they sign. */
function WhatIsTyped() {
  const [reason, at] = useWatch({ name: ['reason', 'effectiveFrom'] }) as [string | undefined, string | undefined];
  const iso = at ? localToIso(at) : null;
  return (
    <dl className="grid grid-cols-1 gap-x-3 gap-y-1.5 sm:grid-cols-[8.5rem_minmax(0,1fr)]">
      <dt className="text-sm text-ink-soft">Reason</dt>
      <dd>{reason?.trim() || '—'}</dd>
      <dt className="text-sm text-ink-soft">Takes effect</dt>
      <dd>{iso ? <span className="font-mono">{formatWhen(iso)}</span> : 'As soon as you sign'}</dd>
    </dl>
  );
}

type SignChangeProps = {
  /** The words on the button that opens the signing dialog and on the one that signs. */
  label: string;
  signer: string;
  /** As a sentence's end: "approve this import and apply it". */
  meaning: string;
  subject: string;
  /** What follows from signing, said in the dialog. */
  children?: ReactNode;
  onSign: (body: ApproveChangeBody) => Promise<unknown>;
};

/**
 * The approval of a process change: a reason and an optional time it takes effect, then the signing
 * dialog (printed name, meaning, reason, time, password). A refusal from the server is shown in the
 * dialog and above the form, in the server's words.
 */
export function SignChange({ label, signer, meaning, subject, children, onSign }: SignChangeProps) {
  return (
    <Form
      schema={signForm}
      defaultValues={{ reason: '', password: '' }}
      onSubmit={({ reason, password, effectiveFrom }) =>
        onSign({
          reason,
          password,
          effectiveFrom: effectiveFrom ? (localToIso(effectiveFrom) ?? undefined) : undefined,
        })
      }
    >
      <TextAreaField name="reason" label="Reason" hint="Why this change, and what asked for it." />
      <div className="max-w-sm">
        <TextField
          name="effectiveFrom"
          label="Takes effect"
          type="datetime-local"
          optional
          hint={`Optional. Blank means as soon as you sign. This computer's local time (UTC${offsetOf(new Date())}).`}
        />
      </div>
      <SignStep label={label} signer={signer} meaning={meaning} subject={subject} size="md">
        <WhatIsTyped />
        {children && <div className="mt-2">{children}</div>}
      </SignStep>
    </Form>
  );
}
