import { countersignBody } from '../../../shared/schemas/ncr';
import { useCountersignNcr } from '../../api/ncrs/countersign-ncr';
import type { NcrDetail } from '../../api/ncrs/types';
import { Form, SubmitButton } from '../../components/form';
import { TextAreaField, TextField } from '../../components/form-fields';
import { PASSWORD_HINT, SigningStatement } from '../../components/signing-statement';
import type { RunStep } from './signing';

/** The second signature on a critical use-as-is, by a quality engineer other than the first signer. */
export function CountersignForm({ ncr, signer, run }: { ncr: NcrDetail; signer: string; run: RunStep }) {
  const countersign = useCountersignNcr(ncr.number);
  return (
    <Form
      schema={countersignBody}
      defaultValues={{ reason: '', password: '' }}
      onSubmit={(body) => run(() => countersign.mutateAsync(body))}
    >
      <p>
        {ncr.decidedBy ?? 'A quality engineer'} signed to use this critical {ncr.lot ? 'lot' : 'part'} as is. It takes
        effect once a second quality engineer agrees and signs.
      </p>
      <TextAreaField
        name="reason"
        label="Reason"
        hint={`Why you agree the ${ncr.lot ? 'lot' : 'part'} can be used as it is.`}
      />
      <SigningStatement signer={signer} meaning="Use as is (second signature)" subject={ncr.number} />
      <TextField
        name="password"
        label="Password"
        type="password"
        autoComplete="current-password"
        hint={PASSWORD_HINT}
      />
      <div className="flex justify-end">
        <SubmitButton>Countersign</SubmitButton>
      </div>
    </Form>
  );
}
