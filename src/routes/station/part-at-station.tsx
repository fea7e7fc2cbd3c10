import { useRef, useState } from 'react';
import type { StationFormJson } from '../../api/station/types';
import type { RecordedResult } from './verdict-panel';
import type { Queued } from '../../lib/offline-queue';
import { Caution } from '../../components/caution';
import { ItemSummary } from '../../components/item-summary';
import { ButtonLink } from '../../components/ui/button';
import { Card, CardBody } from '../../components/ui/card';
import { Notice } from '../../components/ui/notice';
import { formatWhen } from '../../lib/format';
import { raiseConcernHref } from '../../lib/paths';
import { ReadingForm } from './reading-form';
import { SequenceAlert } from './sequence-alert';

type PartAtStationProps = {
  form: StationFormJson;
  canRecord: boolean;
  canAllowReentry: boolean;
  canReadNcr: boolean;
  /** May raise a concern (an NCR) about the part in hand, whatever this station records. */
  canRaiseConcern: boolean;
  onRecorded: (result: RecordedResult) => void;
  onQueued: (entry: Queued) => void;
  onReload: () => void;
};

/** One scanned part at this station, top to bottom: what it is, whether it is due here, what to record. */
export function PartAtStation({
  form,
  canRecord,
  canAllowReentry,
  canReadNcr,
  canRaiseConcern,
  onRecorded,
  onQueued,
  onReload,
}: PartAtStationProps) {
  // made once per opening of the form: every retry of this form sends the same key
  const [opening] = useState(() => ({ key: crypto.randomUUID(), startedAt: new Date().toISOString() }));
  const cautionRef = useRef<HTMLElement>(null);
  const { sequence, stage } = form;
  return (
    <div className="flex flex-col gap-5">
      <Card labelledBy="part-heading">
        <CardBody>
          <h2 id="part-heading" className="sr-only">
            The part
          </h2>
          <div className="flex flex-wrap items-start justify-between gap-4">
            <div className="min-w-0 flex-1">
              <ItemSummary item={form.item} />
            </div>
            {canRaiseConcern && (
              <ButtonLink to={raiseConcernHref(form.item.serial)} size="lg" icon="alert">
                Raise a concern
              </ButtonLink>
            )}
          </div>
          {form.currentResult && (
            <p className="mt-3 text-base text-ink-soft">
              Last recorded at {stage.name}: {form.currentResult.verdict === 'pass' ? 'passed' : 'failed'},{' '}
              {formatWhen(form.currentResult.finishedAt)} by {form.currentResult.operator}.
            </p>
          )}
        </CardBody>
      </Card>
      {!sequence.ok ? (
        <SequenceAlert form={form} canAllowReentry={canAllowReentry} canReadNcr={canReadNcr} onReentry={onReload} />
      ) : (
        <>
          {sequence.code === 'reentry' && (
            <Notice tone="info" title={`Re-entry of ${stage.name}`}>
              <p className="text-base">{sequence.message}</p>
            </Notice>
          )}
          {form.rework && (
            <Notice
              tone="info"
              title={`Sent back by ${form.rework.number}: ${form.rework.disposition === 'repair' ? 'repair' : 'rework'}`}
            >
              <p className="text-base">
                Quality decided: {form.rework.reason} A passing result here closes {form.rework.number}.
              </p>
            </Notice>
          )}
          {stage.hazard && (
            <Caution title={stage.name} ref={cautionRef}>
              <p className="text-lg">{stage.hazard}</p>
              <p className="mt-1 text-base">
                Follow the plant&apos;s own procedures, local codes and licensed practice: this screen does not replace
                them.
              </p>
            </Caution>
          )}
          {form.characteristics.length === 0 ? (
            <Notice tone="info" title="Nothing to record here yet">
              {stage.name} has no characteristics in the spec book. Quality adds them before this station records
              results.
            </Notice>
          ) : (
            <ReadingForm
              form={form}
              idempotencyKey={opening.key}
              startedAt={opening.startedAt}
              canRecord={canRecord}
              onRecorded={onRecorded}
              onQueued={onQueued}
              onReload={onReload}
              cautionRef={stage.hazard ? cautionRef : undefined}
            />
          )}
        </>
      )}
    </div>
  );
}
