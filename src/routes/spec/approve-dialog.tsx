import { z } from 'zod';
import { approveRuleBody, type RuleHistoryJson, type RuleJson } from '../../../shared/schemas/spec';
import { useApproveRule } from '../../api/spec/approve-rule';
import { useRehearsals } from '../../api/spc/rehearsals';
import { Form, SubmitButton } from '../../components/form';
import { TextAreaField, TextField } from '../../components/form-fields';
import { Button } from '../../components/ui/button';
import { Dialog, DialogActions } from '../../components/ui/dialog';
import { Icon } from '../../components/ui/icon';
import { Notice } from '../../components/ui/notice';
import { localToIso, offsetOf } from '../../lib/local-time';
import { currentRehearsal } from '../spc/rehearsal-panel';
import { RehearsalCounts } from '../spc/rehearsal-summary';
import { definitionText, formatNumber, ruleLimitsText, sizeClassesText } from './limits';

/** The shared rules for the reason and the password; the time is typed locally and converted on sending. */
const approveForm = z.strictObject({
  reason: approveRuleBody.shape.reason,
  password: approveRuleBody.shape.password,
  effectiveFrom: z
    .string()
    .optional()
    .refine((v) => !v || localToIso(v) !== null, 'Enter a date and time, or leave it blank for now.'),
});

/** What the signer sees before signing: the same words the server records as the signature's meaning. */
export const signatureMeaning = (history: RuleHistoryJson, draft: RuleJson) =>
  `Approved ${history.family.code} ${history.characteristic.name}, version ${draft.version}`;

type ApproveDialogProps = {
  history: RuleHistoryJson;
  draft: RuleJson;
  signer: string;
  onClose: () => void;
  onApproved: (rule: RuleJson) => void;
};

export function ApproveDialog({ history, draft, signer, onClose, onApproved }: ApproveDialogProps) {
  const approve = useApproveRule();
  const rehearsal = currentRehearsal(useRehearsals(draft.id).data);
  const c = history.characteristic;
  const inForce = c.inForce;
  const how = definitionText(draft);
  const unit = draft.unit ?? c.unit;

  return (
    <Dialog
      open
      onClose={onClose}
      width="wide"
      title={`Approve version ${draft.version}`}
      description="Your password signs the approval. Once approved, this version is never edited."
    >
      <section
        aria-labelledby="signing-heading"
        className="mb-4 rounded-control border border-rule-strong bg-sunk px-4 py-3"
      >
        <h3 id="signing-heading" className="mb-2 flex items-center gap-1.5 font-semibold">
          <Icon name="key" size={18} />
          What you are signing
        </h3>
        <dl className="grid grid-cols-1 gap-x-3 gap-y-1.5 sm:grid-cols-[8.5rem_minmax(0,1fr)]">
          <dt className="text-sm text-ink-soft">Printed name</dt>
          <dd className="font-semibold">{signer}</dd>
          <dt className="text-sm text-ink-soft">Meaning</dt>
          <dd>{signatureMeaning(history, draft)}</dd>
          <dt className="text-sm text-ink-soft">Limits</dt>
          <dd>
            <span className="font-mono font-semibold">{ruleLimitsText(draft, c)}</span>
            {how && <span className="font-mono text-sm text-ink-soft"> ({how})</span>}
            {draft.sizeClasses.length > 0 && (
              <span className="block text-sm text-ink-soft">
                Size classes <span className="font-mono">{sizeClassesText(draft)}</span>
              </span>
            )}
            <span className="block text-sm text-ink-soft">
              Resolution <span className="font-mono">{formatNumber(draft.resolution)}</span>
              {unit ? ` ${unit}` : ''}
            </span>
          </dd>
          <dt className="text-sm text-ink-soft">Supersedes</dt>
          <dd>
            {inForce ? (
              <>
                Version {inForce.version} (<span className="font-mono">{ruleLimitsText(inForce, c)}</span>), from the
                time this takes effect. Results already judged keep their version.
              </>
            ) : (
              'Nothing: no version is in force yet.'
            )}
          </dd>
        </dl>
      </section>
      <section aria-labelledby="rehearsal-heading" className="mb-4 flex flex-col gap-2">
        <h3 id="rehearsal-heading" className="font-semibold">
          What it would change
        </h3>
        {rehearsal ? (
          <>
            <RehearsalCounts rehearsal={rehearsal} />
            <p className="text-sm text-ink-soft">This rehearsal is kept with your approval.</p>
          </>
        ) : (
          <Notice tone="hold">
            Not rehearsed since the draft last changed: close this and rehearse it to see which parts already measured
            would change verdict before you sign.
          </Notice>
        )}
      </section>
      <Form
        schema={approveForm}
        defaultValues={{ reason: '', password: '' }}
        onSubmit={async ({ reason, password, effectiveFrom }) => {
          const at = effectiveFrom ? (localToIso(effectiveFrom) ?? undefined) : undefined;
          const rule = await approve.mutateAsync({
            id: draft.id,
            body: { reason, password, effectiveFrom: at, rehearsalId: rehearsal?.id },
          });
          onApproved(rule);
        }}
      >
        <TextAreaField name="reason" label="Reason" hint="Why this version: the change, and what asked for it." />
        <TextField
          name="effectiveFrom"
          label="Effective from"
          type="datetime-local"
          optional
          hint={`Optional. Blank means as soon as you sign. This computer's local time (UTC${offsetOf(new Date())}).`}
        />
        <TextField
          name="password"
          label="Password"
          type="password"
          autoComplete="current-password"
          hint={`The password ${signer} signs in with.`}
        />
        <DialogActions>
          <Button onClick={onClose}>Cancel</Button>
          <SubmitButton>Sign and approve</SubmitButton>
        </DialogActions>
      </Form>
    </Dialog>
  );
}
