import { useState } from 'react';
import { closeBody, reviewBody, voidBody } from '../../../shared/schemas/ncr';
import { useCloseNcr } from '../../api/ncrs/close-ncr';
import { useStartReview } from '../../api/ncrs/review-ncr';
import type { NcrDetail } from '../../api/ncrs/types';
import { useVoidNcr } from '../../api/ncrs/void-ncr';
import { Form, SubmitButton } from '../../components/form';
import { TextAreaField } from '../../components/form-fields';
import { Button } from '../../components/ui/button';
import { Dialog, DialogActions } from '../../components/ui/dialog';
import type { RunStep } from './signing';

export function ReviewStep({ ncr, run }: { ncr: NcrDetail; run: RunStep }) {
  const review = useStartReview(ncr.number);
  return (
    <Form schema={reviewBody} defaultValues={{ note: '' }} onSubmit={(body) => run(() => review.mutateAsync(body))}>
      <p>
        Take it into review to decide it.{' '}
        {ncr.assignee ? `It stays assigned to ${ncr.assignee}.` : 'Nobody has it yet, so it is assigned to you.'}
      </p>
      <TextAreaField name="note" label="Note (optional)" optional />
      <div className="flex justify-end">
        <SubmitButton>Start review</SubmitButton>
      </div>
    </Form>
  );
}

export function CloseStep({ ncr, run }: { ncr: NcrDetail; run: RunStep }) {
  const close = useCloseNcr(ncr.number);
  const stage = ncr.reworkStage?.name ?? 'the stage it was sent back to';
  return (
    <Form schema={closeBody} defaultValues={{ note: '' }} onSubmit={(body) => run(() => close.mutateAsync(body))}>
      <p>
        The part went back to <span className="font-semibold">{stage}</span>. This NCR closes by itself when the part
        passes that stage again. Close it here only if a passing result there has been recorded and the NCR is still
        open; Coretrail checks for that result.
      </p>
      <TextAreaField name="note" label="Note (optional)" optional />
      <div className="flex justify-end">
        <SubmitButton>Close NCR</SubmitButton>
      </div>
    </Form>
  );
}

export function VoidStep({ ncr, run }: { ncr: NcrDetail; run: RunStep }) {
  const [open, setOpen] = useState(false);
  const voidNcr = useVoidNcr(ncr.number);
  return (
    <>
      <p className="text-ink-soft">
        Raised in error? Voiding keeps it on record, with your reason, and{' '}
        {ncr.lot
          ? 'lets the lot go into units again if nothing else holds it.'
          : 'releases the part if nothing else holds it.'}
      </p>
      <div className="flex justify-end">
        <Button variant="danger" onClick={() => setOpen(true)}>
          Void this NCR
        </Button>
      </div>
      <Dialog
        open={open}
        onClose={() => setOpen(false)}
        title={`Void ${ncr.number}`}
        description="For an NCR raised in error. It stays on record as voided; it is not deleted."
      >
        <Form
          schema={voidBody}
          defaultValues={{ reason: '' }}
          onSubmit={async (body) => {
            await run(() => voidNcr.mutateAsync(body));
            setOpen(false);
          }}
        >
          {ncr.stageResultId !== null && (
            <p className="text-ink-soft">
              A failing station result raised this NCR. It can be voided only once that result has been corrected by a
              passing one; otherwise decide it.
            </p>
          )}
          <TextAreaField name="reason" label="Reason" hint="Why it was raised in error." />
          <DialogActions>
            <Button onClick={() => setOpen(false)}>Cancel</Button>
            <SubmitButton variant="danger">Void NCR</SubmitButton>
          </DialogActions>
        </Form>
      </Dialog>
    </>
  );
}
