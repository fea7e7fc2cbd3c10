import { z } from 'zod';
import { closeCaBody, verifyBody, type CaJson } from '../../../shared/schemas/corrective-action';
import { isoDate } from '../../../shared/schemas/warranty';
import type { SignedIn } from '../../api/auth/me';
import { useCloseCa } from '../../api/corrective-actions/close-ca';
import { useUpdateCa } from '../../api/corrective-actions/update-ca';
import { useVerifyCa } from '../../api/corrective-actions/verify-ca';
import { usePlant } from '../../api/plant/plant';
import { RadioGroupField } from '../../components/choice-fields';
import { Form, SubmitButton } from '../../components/form';
import { TextAreaField, TextField } from '../../components/form-fields';
import { SignStep } from '../../components/sign-dialog';
import { Badge } from '../../components/ui/badge';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Icon } from '../../components/ui/icon';
import { formatWhen } from '../../lib/format';

const dayForm = z.object({ verificationDueOn: isoDate });

/** The check that the actions worked: its day, then what it found once every action is done. */
export function Verification({ ca, editable }: { ca: CaJson; editable: boolean }) {
  const update = useUpdateCa();
  const verify = useVerifyCa();
  const plant = usePlant();
  const today = plant.data?.today;
  const allDone = ca.actions.length > 0 && ca.actions.every((t) => t.doneAt);
  const due = ca.verificationDueOn !== null && today !== undefined && ca.verificationDueOn <= today;
  return (
    <Card labelledBy="ca-verify">
      <CardHeader
        id="ca-verify"
        title="Proof it worked"
        description="After a set time, someone looks again: did the problem stop? Closure waits for a yes."
      />
      <CardBody>
        <div className="flex flex-col gap-4">
          {ca.verification ? (
            <p className="flex items-start gap-2">
              <Icon
                name={ca.verification.effective ? 'ok' : 'bad'}
                size={22}
                className={ca.verification.effective ? 'text-ok' : 'text-bad'}
              />
              <span>
                <span className="font-semibold">{ca.verification.effective ? 'Effective' : 'Not effective'}</span> —{' '}
                {ca.verification.note}
                <span className="block text-sm text-ink-soft">
                  {ca.verification.by} · <span className="font-mono">{formatWhen(ca.verification.at)}</span>
                </span>
              </span>
            </p>
          ) : (
            <p className="text-ink-soft">
              {ca.verificationDueOn
                ? `To be checked on or after ${ca.verificationDueOn}${allDone ? '' : ', once every action is done'}.`
                : 'No day set for the check yet.'}
            </p>
          )}
          {editable && (
            <Form
              key={ca.verificationDueOn ?? 'none'}
              schema={dayForm}
              defaultValues={{ verificationDueOn: ca.verificationDueOn ?? '' }}
              onSubmit={async (body) => {
                await update.mutateAsync({ number: ca.number, body });
              }}
            >
              <div className="grid grid-cols-1 items-start gap-3 sm:grid-cols-[minmax(0,16rem)_auto]">
                <TextField name="verificationDueOn" label="Check effectiveness on" type="date" min={today} />
                <div className="sm:pt-6">
                  <SubmitButton>Set the day</SubmitButton>
                </div>
              </div>
            </Form>
          )}
          {editable && allDone && due && (
            <Form
              schema={verifyBody}
              defaultValues={{ note: '' }}
              onSubmit={async (body) => {
                await verify.mutateAsync({ number: ca.number, body });
              }}
            >
              <RadioGroupField
                name="effective"
                legend="Did the actions work?"
                options={[
                  { value: true, label: 'Yes: the problem has not come back' },
                  { value: false, label: 'No: act again' },
                ]}
              />
              <TextAreaField
                name="note"
                label="What the check found"
                hint="What was looked at, over what span: claims, NCRs, readings."
              />
              <div className="flex justify-end">
                <SubmitButton>Record the check</SubmitButton>
              </div>
            </Form>
          )}
        </div>
      </CardBody>
    </Card>
  );
}

/** Closure: what still stands in its way, or quality's signature. */
export function Closure({ ca, me }: { ca: CaJson; me: SignedIn }) {
  const close = useCloseCa();
  const signature = ca.signatures.find((s) => s.meaning.startsWith('Closed'));
  return (
    <Card labelledBy="ca-close">
      <CardHeader id="ca-close" title="Closure" description="Signed by quality once nothing stands in the way." />
      <CardBody>
        {ca.state === 'closed' ? (
          <div className="flex items-start gap-3">
            <Icon name="key" size={20} className="mt-0.5 text-accent" />
            <div>
              <p className="flex items-center gap-2 text-lg font-semibold">
                <Badge tone="ok">Closed</Badge>
              </p>
              {signature && (
                <>
                  <p className="whitespace-pre-line">{signature.reason}</p>
                  <p className="mt-1 text-ink-soft">
                    Signed by <span className="font-semibold text-ink">{signature.printedName}</span> ·{' '}
                    {signature.meaning} ·{' '}
                    <time className="font-mono" dateTime={signature.signedAt}>
                      {formatWhen(signature.signedAt, { seconds: true })}
                    </time>
                  </p>
                </>
              )}
            </div>
          </div>
        ) : ca.closeBlockers.length ? (
          <div>
            <p className="font-medium">Before it can close:</p>
            <ul className="mt-1 flex flex-col gap-1" aria-label="Before it can close">
              {ca.closeBlockers.map((b) => (
                <li key={b} className="flex items-start gap-2">
                  <Icon name="wait" size={18} className="mt-0.5 shrink-0 text-wait" />
                  {b}
                </li>
              ))}
            </ul>
          </div>
        ) : me.can('corrective-actions.manage') ? (
          <Form
            schema={closeCaBody}
            defaultValues={{ reason: '', password: '' }}
            onSubmit={async (body) => {
              await close.mutateAsync({ number: ca.number, body });
            }}
          >
            <p>Every action is done and the check found them effective.</p>
            <TextAreaField name="reason" label="Why it can close" hint="In a line or two, for an auditor." />
            <SignStep
              label="Sign and close"
              signer={me.user.name}
              meaning="close this corrective action"
              subject={ca.number}
            >
              The record is kept as signed: nothing in it can be changed afterwards. The team is told.
            </SignStep>
          </Form>
        ) : (
          <p className="text-ink-soft">Ready for quality to close.</p>
        )}
      </CardBody>
    </Card>
  );
}
