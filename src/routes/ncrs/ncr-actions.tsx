import { useState, type ReactNode } from 'react';
import { DISPOSITION_LABELS, OPEN_NCR_STATES } from '../../../shared/schemas/ncr';
import type { NcrDetail } from '../../api/ncrs/types';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Notice } from '../../components/ui/notice';
import { formatWhen } from '../../lib/format';
import { ApiError } from '../../lib/http';
import { CountersignForm } from './countersign-form';
import { DecideForm } from './decide-form';
import { CloseStep, ReviewStep, VoidStep } from './ncr-steps';
import { heldWords } from './ncr-words';
import type { RunStep } from './signing';

function Step({ title, children }: { title: string; children: ReactNode }) {
  return (
    <section className="flex flex-col gap-3 border-t border-rule px-5 py-4 first:border-t-0">
      <h3 className="font-semibold">{title}</h3>
      {children}
    </section>
  );
}

/** What was decided, by whom, and what it means for the part or lot. */
export function NcrDecision({ ncr }: { ncr: NcrDetail }) {
  if (!ncr.disposition) return null;
  return (
    <Card labelledBy="ncr-decision-heading">
      <CardHeader
        id="ncr-decision-heading"
        title={ncr.awaitingSecondSignature ? 'Decision, not yet in effect' : 'Decision'}
      />
      <CardBody>
        <dl className="grid grid-cols-[auto_minmax(0,1fr)] gap-x-4 gap-y-1.5">
          <dt className="text-ink-soft">Disposition</dt>
          <dd className="font-semibold">{DISPOSITION_LABELS[ncr.disposition]}</dd>
          {ncr.reworkStage && (
            <>
              <dt className="text-ink-soft">Back to</dt>
              <dd>{ncr.reworkStage.name}</dd>
            </>
          )}
          <dt className="text-ink-soft">Reason</dt>
          <dd className="whitespace-pre-line">{ncr.dispositionReason}</dd>
          <dt className="text-ink-soft">Decided by</dt>
          <dd>
            {ncr.decidedBy ?? '—'}
            {ncr.decidedAt && <span className="font-mono text-sm text-ink-soft"> {formatWhen(ncr.decidedAt)}</span>}
          </dd>
        </dl>
        {ncr.awaitingSecondSignature && (
          <div className="mt-3">
            <Notice tone="hold" title="Waiting for a second signature">
              A critical {ncr.lot ? 'lot' : 'part'} used as is needs a second quality engineer to countersign. Until
              then {heldWords(ncr)}.
            </Notice>
          </div>
        )}
      </CardBody>
    </Card>
  );
}

/**
 * The steps the server says this person may take now (`allowed`), and nothing else. A step refused
 * because the NCR moved on meanwhile is said above the steps, which by then show what is possible.
 */
export function NcrActions({
  ncr,
  me,
  canDecide,
}: {
  ncr: NcrDetail;
  me: { id: number; name: string };
  canDecide: boolean;
}) {
  const signer = me.name;
  const [refusal, setRefusal] = useState<string | null>(null);
  const run: RunStep = async (step) => {
    setRefusal(null);
    try {
      await step();
    } catch (err) {
      if (err instanceof ApiError && err.status === 409 && err.details.reason === 'invalid_transition') {
        setRefusal(err.message);
        return;
      }
      throw err;
    }
  };
  const allowed = new Set(ncr.allowed);
  const open = OPEN_NCR_STATES.includes(ncr.state);
  const waitingOnOther = ncr.awaitingSecondSignature && !allowed.has('countersign');

  return (
    <Card labelledBy="ncr-actions-heading">
      <CardHeader id="ncr-actions-heading" title="Next step" />
      {refusal && (
        <div className="px-5 pt-4">
          <Notice tone="bad" live="alert" title="That step was not taken">
            {refusal}
          </Notice>
        </div>
      )}
      {allowed.size === 0 && (
        <CardBody>
          <p className="text-ink-soft">
            {!open
              ? `This NCR is ${ncr.state === 'voided' ? 'voided' : 'closed'}: it takes no further steps.`
              : canDecide
                ? 'Nothing for you to do on it now.'
                : `A quality engineer decides this NCR. Until then ${heldWords(ncr)}; you can follow it here.`}
          </p>
        </CardBody>
      )}
      {waitingOnOther && canDecide && (
        <CardBody>
          <p>
            {ncr.decidedById === me.id ? 'You signed first, so' : 'Once the first signature is in,'} the
            countersignature must come from another quality engineer.
          </p>
        </CardBody>
      )}
      <div>
        {allowed.has('review') && (
          <Step title="Start review">
            <ReviewStep ncr={ncr} run={run} />
          </Step>
        )}
        {allowed.has('disposition') && (
          <Step title="Decide">
            <DecideForm ncr={ncr} signer={signer} run={run} />
          </Step>
        )}
        {allowed.has('countersign') && (
          <Step title="Countersign">
            <CountersignForm ncr={ncr} signer={signer} run={run} />
          </Step>
        )}
        {allowed.has('close') && (
          <Step title="Close">
            <CloseStep ncr={ncr} run={run} />
          </Step>
        )}
        {allowed.has('void') && (
          <Step title="Void">
            <VoidStep ncr={ncr} run={run} />
          </Step>
        )}
      </div>
    </Card>
  );
}
