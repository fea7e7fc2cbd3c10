import { useState } from 'react';
import { replacePartBody } from '../../../shared/schemas/build';
import type { ItemJson } from '../../api/items/types';
import { useReplacePart } from '../../api/build/replace-part';
import { RadioGroupField } from '../../components/choice-fields';
import { Form, SubmitButton } from '../../components/form';
import { TextAreaField, TextField } from '../../components/form-fields';
import { ScanBox } from '../../components/scan-box';
import { ButtonLink } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Notice } from '../../components/ui/notice';
import { partName } from '../../lib/item-status';
import { stationHref } from '../../lib/paths';

const statusWords: Record<string, string> = { scrapped: ' — scrapped', on_hold: ' — on hold' };

/**
 * A part found bad after assembly (a cracked head, say) comes out and a finished one goes in. The
 * unit keeps the record of both, and goes back to assembly: the bolts are torqued and the engine
 * run again with the new part in.
 */
export function ReplacePart() {
  const [unit, setUnit] = useState<ItemJson | null>(null);
  const [done, setDone] = useState<{ unit: ItemJson; removed: string; fitted: string } | null>(null);
  const replace = useReplacePart();
  if (done) {
    return (
      <Card labelledBy="replaced-heading">
        <CardHeader id="replaced-heading" title="Part replaced" />
        <CardBody>
          <div className="flex flex-col gap-4">
            <Notice tone="ok" live="status" title={`${done.fitted} fitted in ${done.unit.serial}`}>
              {done.removed} was taken out; the unit keeps the record of both. It goes back to{' '}
              {done.unit.currentStage?.name ?? 'its first stage'}: record assembly, the run test and final inspection
              again before it can ship.
            </Notice>
            <div className="flex flex-wrap gap-2">
              <ButtonLink to={stationHref(done.unit.serial)} variant="primary" size="lg" icon="arrowRight">
                Record assembly at the station
              </ButtonLink>
            </div>
          </div>
        </CardBody>
      </Card>
    );
  }
  return (
    <Card labelledBy="replace-heading">
      <CardHeader
        id="replace-heading"
        title="Replace a part in a built unit"
        description="Scan the long block, choose the part that comes out, scan the finished part that goes in."
      />
      <CardBody>
        <div className="flex flex-col gap-5">
          <ScanBox onItem={setUnit} preview={false} hint="Scan the long block's label." />
          {unit && unit.kind !== 'long_block' && (
            <Notice tone="bad">{unit.serial} is not a long block: scan the unit the part is in.</Notice>
          )}
          {unit && unit.kind === 'long_block' && (
            <Form
              key={unit.serial}
              schema={replacePartBody}
              defaultValues={{
                remove: unit.parts.find((p) => p.status === 'scrapped')?.serial ?? '',
                fit: '',
                reason: '',
              }}
              onSubmit={async (body) => {
                const after = await replace.mutateAsync({ serial: unit.serial, body });
                setDone({ unit: after, removed: body.remove, fitted: body.fit.toUpperCase() });
              }}
            >
              <RadioGroupField
                name="remove"
                legend={`Part to take out of ${unit.serial}`}
                columns={2}
                options={unit.parts.map((p) => ({
                  value: p.serial,
                  label: `${partName(p.kindLabel, p.positionLabel)} ${p.serial}${statusWords[p.status] ?? ''}`,
                }))}
              />
              <TextField
                name="fit"
                label="Part to fit"
                mono
                hint="Scan or type the serial of a finished part of the same kind and family (for a V engine, the same side)."
              />
              <TextAreaField name="reason" label="Why it is replaced" />
              <div className="flex justify-end">
                <SubmitButton size="lg">Replace the part</SubmitButton>
              </div>
            </Form>
          )}
        </div>
      </CardBody>
    </Card>
  );
}
