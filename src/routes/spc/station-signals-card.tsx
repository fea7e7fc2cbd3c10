import { useState } from 'react';
import { holdSignalBody, type StoredSignalJson } from '../../../shared/schemas/spc';
import { useHoldSignal } from '../../api/spc/hold-signal';
import { useSignals } from '../../api/spc/signals';
import { Form, SubmitButton } from '../../components/form';
import { TextAreaField } from '../../components/form-fields';
import { Badge } from '../../components/ui/badge';
import { Button } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Dialog, DialogActions } from '../../components/ui/dialog';
import { EmptyRow, Table, TableFrame, TBody, TD, TH, THead, TR } from '../../components/ui/table';
import { formatWhen, plural } from '../../lib/format';
import { CsvButton } from './numbers-panel';
import { fixed } from './numbers';

function HoldDialog({ signal, onClose }: { signal: StoredSignalJson; onClose: () => void }) {
  const hold = useHoldSignal();
  return (
    <Dialog
      open
      onClose={onClose}
      title={`Hold ${signal.serial}`}
      description="An NCR is raised and the part is held until quality decides, as for any concern."
    >
      <Form
        schema={holdSignalBody}
        defaultValues={{ reason: '' }}
        onSubmit={async (v) => {
          await hold.mutateAsync({ id: signal.id, reason: v.reason });
          onClose();
        }}
      >
        <p>
          {signal.chartLabel}: {signal.text} (rule {signal.rule}).
        </p>
        <TextAreaField name="reason" label="Reason" hint="What you saw on the chart, and what should be checked." />
        <DialogActions>
          <Button onClick={onClose}>Cancel</Button>
          <SubmitButton>Raise the NCR and hold</SubmitButton>
        </DialogActions>
      </Form>
    </Dialog>
  );
}

/** Signals station results raised against frozen limits, as they were mailed, with any hold. */
export function StationSignalsCard({
  family,
  characteristicId,
  canHold,
  digits,
}: {
  family: string;
  characteristicId: number;
  canHold: boolean;
  digits: number;
}) {
  const signals = useSignals(family, characteristicId);
  const [holding, setHolding] = useState<StoredSignalJson | null>(null);
  const rows = signals.data ?? [];
  return (
    <Card labelledBy="station-signals-heading">
      <CardHeader
        id="station-signals-heading"
        title="Signals raised at the station"
        description="Each result is judged against frozen limits as it is recorded; a signal mails quality at once."
        actions={rows.length ? <Badge tone="bad">{plural(rows.length, 'signal')}</Badge> : null}
      />
      <TableFrame label="Signals raised at the station">
        <Table caption="Signals raised at the station">
          <THead>
            <tr>
              <TH>Recorded</TH>
              <TH>Serial</TH>
              <TH>Station</TH>
              <TH>Chart</TH>
              <TH>Rule</TH>
              <TH align="right">Value</TH>
              <TH>Hold</TH>
            </tr>
          </THead>
          <TBody>
            {rows.length === 0 && (
              <EmptyRow colSpan={7}>
                {signals.isPending ? 'Loading…' : 'None: no result has broken a run rule against frozen limits.'}
              </EmptyRow>
            )}
            {rows.map((s) => (
              <TR key={s.id}>
                <TD mono nowrap>
                  {formatWhen(s.at)}
                </TD>
                <TD mono>{s.serial}</TD>
                <TD mono>{s.station ?? '—'}</TD>
                <TD>{s.chartLabel}</TD>
                <TD>
                  <Badge tone="bad" icon={null}>
                    ◆ Rule {s.rule}
                  </Badge>
                </TD>
                <TD align="right" mono>
                  {fixed(s.value, digits + 1)}
                </TD>
                <TD>
                  {s.ncr ? (
                    <Badge tone="hold">Held: {s.ncr}</Badge>
                  ) : canHold ? (
                    <span data-density="floor">
                      <Button onClick={() => setHolding(s)}>Hold the part…</Button>
                    </span>
                  ) : (
                    <Badge tone="off">Not held</Badge>
                  )}
                </TD>
              </TR>
            ))}
          </TBody>
        </Table>
      </TableFrame>
      <CardBody>
        <div data-density="floor">
          <CsvButton
            filename={`${family}-${characteristicId}-station-signals.csv`}
            rows={rows}
            columns={[
              { header: 'Recorded', text: (s) => s.at },
              { header: 'Serial', text: (s) => s.serial },
              { header: 'Station', text: (s) => s.station ?? '' },
              { header: 'Chart', text: (s) => s.chart },
              { header: 'Rule', text: (s) => String(s.rule) },
              { header: 'Value', text: (s) => String(s.value) },
              { header: 'Centre', text: (s) => String(s.centre) },
              { header: 'Lower limit', text: (s) => String(s.lower) },
              { header: 'Upper limit', text: (s) => String(s.upper) },
              { header: 'NCR', text: (s) => s.ncr ?? '' },
            ]}
          />
        </div>
      </CardBody>
      {holding && <HoldDialog signal={holding} onClose={() => setHolding(null)} />}
    </Card>
  );
}
