import { useState } from 'react';
import { z } from 'zod';
import { CHART_METHOD_LABELS, freezeLimitsBody, type SpcChartJson } from '../../../shared/schemas/spc';
import { useFreezeLimits } from '../../api/spc/freeze-limits';
import { CheckboxField } from '../../components/choice-fields';
import { Form, SubmitButton } from '../../components/form';
import { TextAreaField, TextField } from '../../components/form-fields';
import { Badge } from '../../components/ui/badge';
import { Button } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Dialog, DialogActions } from '../../components/ui/dialog';
import { Notice } from '../../components/ui/notice';
import { formatWhen } from '../../lib/format';
import { fixed } from './numbers';

const freezeForm = z.strictObject({
  baselineFrom: z.iso.date('Enter the first day of the baseline.'),
  baselineTo: z.iso.date('Enter the last day of the baseline.'),
  reason: freezeLimitsBody.shape.reason,
  holdOnSignal: z.boolean(),
  thisStation: z.boolean(),
});

function FreezeDialog({
  chart,
  from,
  to,
  onClose,
  onFrozen,
}: {
  chart: SpcChartJson;
  from: string;
  to: string;
  onClose: () => void;
  onFrozen: (text: string) => void;
}) {
  const freeze = useFreezeLimits();
  return (
    <Dialog
      open
      onClose={onClose}
      width="wide"
      title="Freeze control limits"
      description="Coretrail works the limits out from the baseline’s readings and keeps them, with your name, the time and your reason. Later results are judged against them; a new freeze replaces them, and they are never edited."
    >
      <Form
        schema={freezeForm}
        defaultValues={{
          baselineFrom: from,
          baselineTo: to,
          reason: '',
          holdOnSignal: false,
          thisStation: !!chart.station,
        }}
        onSubmit={async (v) => {
          const frozen = await freeze.mutateAsync({
            family: chart.family.code,
            characteristicId: chart.characteristic.id,
            station: v.thisStation ? chart.station : null,
            chart: chart.method,
            baselineFrom: v.baselineFrom,
            baselineTo: v.baselineTo,
            reason: v.reason,
            holdOnSignal: v.holdOnSignal,
          });
          onFrozen(
            `Limits frozen from ${frozen.baselinePoints} parts: centre ${fixed(frozen.centre, 5)}, ${fixed(frozen.lower, 5)} to ${fixed(frozen.upper, 5)}.`,
          );
        }}
      >
        <p>
          <span className="font-semibold">{CHART_METHOD_LABELS[chart.method]}</span> for {chart.family.code}{' '}
          {chart.characteristic.name}
          {chart.station ? `, station ${chart.station}` : ', every station'}.
        </p>
        <div className="grid grid-cols-1 gap-3 sm:grid-cols-2">
          <TextField name="baselineFrom" label="Baseline from" type="date" />
          <TextField name="baselineTo" label="Baseline to (included)" type="date" />
        </div>
        <TextAreaField
          name="reason"
          label="Reason"
          hint="Why these limits now: a stable run after a change, a new machine, a periodic review."
        />
        {chart.station && <CheckboxField name="thisStation" label={`Only for results at ${chart.station}`} />}
        <CheckboxField
          name="holdOnSignal"
          label="Put a part on hold (an NCR) when its result breaks a run rule; quality is mailed either way"
        />
        <DialogActions>
          <Button onClick={onClose}>Cancel</Button>
          <SubmitButton>Freeze limits</SubmitButton>
        </DialogActions>
      </Form>
    </Dialog>
  );
}

/** Which limits the chart uses — frozen (who, when, why) or worked out from the baseline — and the way to freeze them. */
export function LimitsCard({
  chart,
  canFreeze,
  from,
  to,
}: {
  chart: SpcChartJson;
  canFreeze: boolean;
  from: string;
  to: string;
}) {
  const [freezing, setFreezing] = useState(false);
  const [said, setSaid] = useState<string | null>(null);
  const l = chart.limits;
  const oneReading = chart.method === 'i-mr' || chart.subgroupSize === 1;
  const perPart = !(chart.method === 'xbar-r' || chart.method === 'xbar-s') || !oneReading;
  return (
    <Card labelledBy="limits-heading">
      <CardHeader
        id="limits-heading"
        title="Control limits"
        actions={
          l?.source === 'frozen' ? (
            <Badge tone="ok">Frozen</Badge>
          ) : l ? (
            <Badge tone="wait">Trial: from this baseline</Badge>
          ) : null
        }
      />
      <CardBody>
        <div className="flex flex-col gap-3">
          {said && (
            <Notice tone="ok" live="status">
              {said}
            </Notice>
          )}
          {l?.source === 'frozen' && (
            <dl className="grid grid-cols-1 gap-x-4 gap-y-1.5 sm:grid-cols-[10rem_minmax(0,1fr)]">
              <dt className="text-sm text-ink-soft">Frozen by</dt>
              <dd>
                {l.frozen.frozenBy}, <span className="font-mono">{formatWhen(l.frozen.frozenAt)}</span>
              </dd>
              <dt className="text-sm text-ink-soft">Why</dt>
              <dd>{l.frozen.reason}</dd>
              <dt className="text-sm text-ink-soft">Baseline</dt>
              <dd>
                <span className="font-mono">
                  {formatWhen(l.frozen.baselineFrom).slice(0, 10)} to {formatWhen(l.frozen.baselineTo).slice(0, 10)}
                </span>
                , {l.frozen.baselinePoints} parts
              </dd>
              <dt className="text-sm text-ink-soft">Scope</dt>
              <dd>
                {l.frozen.station ? `Results at ${l.frozen.station}` : 'Results at every station'};{' '}
                {l.frozen.holdOnSignal ? 'a signal holds the part and mails quality' : 'a signal mails quality'}
              </dd>
            </dl>
          )}
          {l?.source === 'trial' && (
            <p>
              Worked out from {chart.baseline ? chart.baseline.to - chart.baseline.from + 1 : 0} points
              {l.baselineFrom ? (
                <>
                  {' '}
                  recorded <span className="font-mono">{formatWhen(l.baselineFrom).slice(0, 10)}</span> to{' '}
                  <span className="font-mono">{formatWhen(l.baselineTo).slice(0, 10)}</span>
                </>
              ) : (
                ' (the whole period)'
              )}
              . They move with the baseline: freeze them to judge later results against them.
            </p>
          )}
          {chart.frozenElsewhere && (
            <Notice tone="info">
              Limits frozen {formatWhen(chart.frozenElsewhere.frozenAt).slice(0, 10)} by{' '}
              {chart.frozenElsewhere.frozenBy} are for the {CHART_METHOD_LABELS[chart.frozenElsewhere.method]} chart
              {chart.frozenElsewhere.station ? ` at ${chart.frozenElsewhere.station}` : ''}; this chart uses trial
              limits.
            </Notice>
          )}
          {canFreeze && chart.charts.length > 0 && perPart && (
            <div data-density="floor">
              <Button
                variant={l?.source === 'frozen' ? 'secondary' : 'primary'}
                icon="key"
                onClick={() => setFreezing(true)}
              >
                {l?.source === 'frozen' ? 'Freeze new limits…' : 'Freeze these limits…'}
              </Button>
            </div>
          )}
        </div>
      </CardBody>
      {freezing && (
        <FreezeDialog
          chart={chart}
          from={l?.source === 'trial' && l.baselineFrom ? l.baselineFrom.slice(0, 10) : from}
          to={l?.source === 'trial' && l.baselineTo ? l.baselineTo.slice(0, 10) : to}
          onClose={() => setFreezing(false)}
          onFrozen={(text) => {
            setFreezing(false);
            setSaid(text);
          }}
        />
      )}
    </Card>
  );
}
