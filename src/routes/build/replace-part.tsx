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
import { t } from '../../lib/i18n';
import { stationHref } from '../../lib/paths';

const statusWords: Record<string, string> = { scrapped: 'replace.scrapped', on_hold: 'replace.onHold' };

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
        <CardHeader id="replaced-heading" title={t('replace.done')} />
        <CardBody>
          <div className="flex flex-col gap-4">
            <Notice
              tone="ok"
              live="status"
              title={t('replace.fitted', { fitted: done.fitted, unit: done.unit.serial })}
            >
              {t('replace.goesBack', {
                removed: done.removed,
                stage: done.unit.currentStage?.name ?? t('replace.firstStage'),
              })}
            </Notice>
            <div className="flex flex-wrap gap-2">
              <ButtonLink to={stationHref(done.unit.serial)} variant="primary" size="lg" icon="arrowRight">
                {t('replace.toStation')}
              </ButtonLink>
            </div>
          </div>
        </CardBody>
      </Card>
    );
  }
  return (
    <Card labelledBy="replace-heading">
      <CardHeader id="replace-heading" title={t('build.modeReplace')} description={t('replace.description')} />
      <CardBody>
        <div className="flex flex-col gap-5">
          <ScanBox onItem={setUnit} preview={false} hint={t('replace.scanHint')} />
          {unit && unit.kind !== 'long_block' && (
            <Notice tone="bad">{t('replace.notUnit', { serial: unit.serial })}</Notice>
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
                legend={t('replace.remove', { serial: unit.serial })}
                columns={2}
                options={unit.parts.map((p) => ({
                  value: p.serial,
                  label: `${partName(p.kindLabel, p.positionLabel)} ${p.serial}${statusWords[p.status] ? ` — ${t(statusWords[p.status]!)}` : ''}`,
                }))}
              />
              <TextField name="fit" label={t('replace.fit')} mono hint={t('replace.fitHint')} />
              <TextAreaField name="reason" label={t('replace.reason')} />
              <div className="flex justify-end">
                <SubmitButton size="lg">{t('replace.submit')}</SubmitButton>
              </div>
            </Form>
          )}
        </div>
      </CardBody>
    </Card>
  );
}
