import { useState } from 'react';
import { CREDIT_DECISIONS } from '../../../shared/schemas/intake';
import { creditRevisionBody } from '../../../shared/schemas/warranty';
import type { CoreDetail } from '../../api/cores/types';
import { useCreditRevisions } from '../../api/warranty/credit';
import { useReviseCredit } from '../../api/warranty/revise-credit';
import { RadioGroupField } from '../../components/choice-fields';
import { Form, SubmitButton } from '../../components/form';
import { TextAreaField } from '../../components/form-fields';
import { PhotoField } from '../../components/photo-field';
import { Button } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { formatWhen } from '../../lib/format';
import { t } from '../../lib/i18n';
import { CREDIT_LABELS } from '../../lib/intake-labels';
import { label } from '../../lib/server-messages';

/**
 * A returned core's credit as decided at the dock and as settled after its teardown: every
 * revision is a new record with its reason and who made it; the dock's decision stays beside them.
 */
export function CreditSettled({ core, canRevise }: { core: CoreDetail; canRevise: boolean }) {
  const revisions = useCreditRevisions(core.serial);
  const revise = useReviseCredit(core.serial);
  const [open, setOpen] = useState(false);
  const rows = revisions.data ?? [];
  const current = rows.at(-1)?.creditDecision ?? core.receipt.creditDecision;
  const may = canRevise && core.status === 'torn_down';
  return (
    <Card labelledBy="credit-heading">
      <CardHeader
        id="credit-heading"
        title={t('corePage.receipt.credit')}
        description={t('corePage.credit.description')}
        actions={
          may &&
          !open && (
            <Button size="sm" onClick={() => setOpen(true)}>
              {t('corePage.credit.settle')}
            </Button>
          )
        }
      />
      <CardBody>
        <ol className="flex flex-col gap-2">
          <li>
            <span className="text-sm text-ink-soft">{t('corePage.credit.atDock')} · </span>
            <span className="font-semibold">
              {core.receipt.creditDecision ? label(CREDIT_LABELS[core.receipt.creditDecision]) : '—'}
            </span>
            {core.receipt.creditReason && <span className="block text-ink-soft">{core.receipt.creditReason}</span>}
          </li>
          {rows.map((r) => (
            <li key={r.revisedAt} className="border-t border-rule pt-2">
              <span className="text-sm text-ink-soft">
                {t('corePage.credit.settledBy', { name: r.revisedBy })} ·{' '}
                <span className="font-mono">{formatWhen(r.revisedAt)}</span> ·{' '}
              </span>
              <span className="font-semibold">{label(CREDIT_LABELS[r.creditDecision])}</span>
              <span className="block whitespace-pre-line">{r.reason}</span>
              {r.photos.length > 0 && (
                <span className="mt-1 flex flex-wrap gap-2">
                  {r.photos.map((p) => (
                    <a key={p.id} href={p.url} target="_blank" rel="noreferrer">
                      <img
                        src={p.url}
                        alt={p.fileName}
                        className="h-20 w-28 rounded-control border border-rule-strong object-cover"
                      />
                    </a>
                  ))}
                </span>
              )}
            </li>
          ))}
        </ol>
        {open && (
          <div className="mt-3 border-t border-rule pt-3">
            <Form
              schema={creditRevisionBody}
              defaultValues={{ reason: '', photoIds: [] }}
              onSubmit={async (body) => {
                await revise.mutateAsync({ serial: core.serial, body });
                setOpen(false);
              }}
            >
              <RadioGroupField
                name="creditDecision"
                legend={t('corePage.credit.settled')}
                columns={3}
                options={CREDIT_DECISIONS.filter((d) => d !== current).map((d) => ({
                  value: d,
                  label: label(CREDIT_LABELS[d]),
                }))}
              />
              <TextAreaField name="reason" label={t('corePage.credit.showed')} hint={t('corePage.credit.showedHint')} />
              <PhotoField name="photoIds" label={t('corePage.core.photos')} max={8} />
              <div className="flex justify-end gap-2">
                <Button onClick={() => setOpen(false)}>{t('common.cancel')}</Button>
                <SubmitButton>{t('corePage.credit.record')}</SubmitButton>
              </div>
            </Form>
          </div>
        )}
      </CardBody>
    </Card>
  );
}
