import {
  CLAIM_DECISION_LABELS,
  CLAIM_DECISIONS,
  closeClaimBody,
  decideClaimBody,
  returnUnitBody,
  type ClaimJson,
} from '../../../shared/schemas/warranty';
import { useSignedIn } from '../../api/auth/me';
import { useClaimStep } from '../../api/warranty/claim-step';
import { RadioGroupField } from '../../components/choice-fields';
import { Form } from '../../components/form';
import { TextAreaField, TextField } from '../../components/form-fields';
import { SignStep } from '../../components/sign-dialog';

/** Receiving takes the unit back: its shipment ends and it no longer counts as shipped. */
export function ReturnForm({ claim }: { claim: ClaimJson }) {
  const me = useSignedIn();
  const step = useClaimStep(claim.number, 'return');
  return (
    <Form schema={returnUnitBody} defaultValues={{ note: '', password: '' }} onSubmit={(b) => step.mutateAsync(b)}>
      <p>
        When <span className="font-mono font-semibold">{claim.unit.serial}</span> arrives, check its label against the
        claim, then take it back. Its shipment (order <span className="font-mono">{claim.shipment.reference}</span>)
        ends here.
      </p>
      <TextField name="note" label="How it arrived" hint="Crate, seals, fluids, anything missing." />
      <SignStep
        label="Sign and take the unit back"
        signer={me?.user.name ?? 'you'}
        meaning="receive this unit back under the claim"
        subject={claim.number}
      >
        The unit’s shipment ends and it shows as back from the field; the floor is told it is ready for teardown.
      </SignStep>
    </Form>
  );
}

/** The desk's signed decision; before the teardown, only a rejection. */
export function DecideForm({ claim }: { claim: ClaimJson }) {
  const me = useSignedIn();
  const step = useClaimStep(claim.number, 'decide');
  const choices = CLAIM_DECISIONS.filter((d) => claim.state === 'torn_down' || d === 'rejected');
  return (
    <Form schema={decideClaimBody} defaultValues={{ reason: '', password: '' }} onSubmit={(b) => step.mutateAsync(b)}>
      {claim.state === 'received' && (
        <p className="text-ink-soft">The unit has not been torn down: only a rejection can be decided now.</p>
      )}
      <RadioGroupField
        name="decision"
        legend="Decision"
        columns={3}
        options={choices.map((d) => ({ value: d, label: CLAIM_DECISION_LABELS[d] }))}
        hint="The customer on file is told, with your reason and your name."
      />
      <TextAreaField name="reason" label="Reason" hint="Why, in words the customer and an auditor will read." />
      <SignStep
        label="Sign the decision"
        signer={me?.user.name ?? 'you'}
        meaning="decide this claim"
        subject={claim.number}
      >
        The customer on file is mailed the decision with your reason and your name.
      </SignStep>
    </Form>
  );
}

export function CloseForm({ claim }: { claim: ClaimJson }) {
  const me = useSignedIn();
  const step = useClaimStep(claim.number, 'close');
  return (
    <Form schema={closeClaimBody} defaultValues={{ note: '', password: '' }} onSubmit={(b) => step.mutateAsync(b)}>
      <TextField
        name="note"
        label="Closing note"
        hint="Credit issued, parts sent, anything still to tell the customer."
      />
      <SignStep
        label="Sign and close the claim"
        signer={me?.user.name ?? 'you'}
        meaning="close this claim"
        subject={claim.number}
      >
        Nothing more is done on the claim once it is closed; the customer on file is told.
      </SignStep>
    </Form>
  );
}
