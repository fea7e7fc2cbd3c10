import { useId } from 'react';
import { useFormContext } from 'react-hook-form';
import { reentryBody } from '../../../shared/schemas/results';
import { useAllowReentry } from '../../api/station/allow-reentry';
import type { StationFormJson } from '../../api/station/types';
import { Form, SubmitButton } from '../../components/form';
import { describedBy, Field } from '../../components/ui/field';
import { Button } from '../../components/ui/button';
import { Dialog, DialogActions } from '../../components/ui/dialog';
import { t } from '../../lib/i18n';
import { bigControl } from './controls';

function ReasonField() {
  const id = useId();
  const { register, formState } = useFormContext<{ reason: string }>();
  const error = formState.errors.reason?.message;
  const hint = t('reentry.hint');
  return (
    <Field id={id} label={t('reentry.reason')} hint={hint} error={error}>
      <textarea
        id={id}
        autoFocus
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(id, hint, error)}
        className={`${bigControl} min-h-28 py-2`}
        {...register('reason')}
      />
    </Field>
  );
}

/**
 * A supervisor's reason for sending a part through a stage again. Its own module: it validates
 * with the shared zod schema, which a station tablet loads only when someone opens this dialog.
 */
export function ReentryDialog({
  form,
  onClose,
  onDone,
}: {
  form: StationFormJson;
  onClose: () => void;
  onDone: () => void;
}) {
  const allow = useAllowReentry();
  return (
    <Dialog
      open
      onClose={onClose}
      title={t('reentry.title')}
      description={t('reentry.description', { serial: form.item.serial, stage: form.stage.name })}
    >
      <div data-density="floor">
        <Form
          schema={reentryBody}
          defaultValues={{ stage: form.stage.code, reason: '' }}
          onSubmit={async (body) => {
            await allow.mutateAsync({ serial: form.item.serial, body });
            onDone();
          }}
        >
          <ReasonField />
          <DialogActions>
            <Button size="lg" onClick={onClose}>
              {t('common.cancel')}
            </Button>
            <SubmitButton size="lg">{t('reentry.title')}</SubmitButton>
          </DialogActions>
        </Form>
      </div>
    </Dialog>
  );
}
