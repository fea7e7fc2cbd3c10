import { useRef, useState } from 'react';
import type { StationFormJson } from '../../api/station/types';
import type { RecordedResult } from './verdict-panel';
import type { Queued } from '../../lib/offline-queue';
import { Caution } from '../../components/caution';
import { ItemSummary } from '../../components/item-summary';
import { ButtonLink } from '../../components/ui/button';
import { Card, CardBody } from '../../components/ui/card';
import { Notice } from '../../components/ui/notice';
import { formatMoment, useT } from '../../lib/i18n';
import { localizeHazard } from '../../lib/server-messages';
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
  const t = useT();
  return (
    <div className="flex flex-col gap-5">
      <Card labelledBy="part-heading">
        <CardBody>
          <h2 id="part-heading" className="sr-only">
            {t('part.heading')}
          </h2>
          <div className="flex flex-wrap items-start justify-between gap-4">
            <div className="min-w-0 flex-1">
              <ItemSummary item={form.item} />
            </div>
            {canRaiseConcern && (
              <ButtonLink to={raiseConcernHref(form.item.serial)} size="lg" icon="alert">
                {t('part.raiseConcern')}
              </ButtonLink>
            )}
          </div>
          {form.currentResult && (
            <p className="mt-3 text-base text-ink-soft">
              {t('part.lastRecorded', {
                stage: stage.name,
                verdict: t(form.currentResult.verdict === 'pass' ? 'waiting.passed' : 'waiting.failed'),
                when: formatMoment(form.currentResult.finishedAt),
                who: form.currentResult.operator,
              })}
            </p>
          )}
        </CardBody>
      </Card>
      {!sequence.ok ? (
        <SequenceAlert form={form} canAllowReentry={canAllowReentry} canReadNcr={canReadNcr} onReentry={onReload} />
      ) : (
        <>
          {sequence.code === 'reentry' && (
            <Notice tone="info" title={t('part.reentry', { stage: stage.name })}>
              <p className="text-base">{sequence.message}</p>
            </Notice>
          )}
          {form.rework && (
            <Notice
              tone="info"
              title={t('part.sentBack', {
                ncr: form.rework.number,
                kind: t(form.rework.disposition === 'repair' ? 'part.repair' : 'part.rework'),
              })}
            >
              <p className="text-base">
                {t('part.qualityDecided', { reason: form.rework.reason, ncr: form.rework.number })}
              </p>
            </Notice>
          )}
          {stage.hazard && (
            <Caution title={stage.name} ref={cautionRef}>
              <p className="text-lg">{localizeHazard(stage.hazard)}</p>
              <p className="mt-1 text-base">{t('part.procedures')}</p>
            </Caution>
          )}
          {form.characteristics.length === 0 ? (
            <Notice tone="info" title={t('part.nothingTitle')}>
              {t('part.nothingBody', { stage: stage.name })}
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
