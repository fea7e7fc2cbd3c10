import { useState } from 'react';
import { containmentBody, OPEN_NCR_STATES } from '../../../shared/schemas/ncr';
import { useUpdateContainment } from '../../api/ncrs/update-containment';
import type { NcrDetail } from '../../api/ncrs/types';
import { Form, SubmitButton } from '../../components/form';
import { TextAreaField } from '../../components/form-fields';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Notice } from '../../components/ui/notice';

/** What was done to keep the part from going on: quality keeps it current while the NCR is open. */
export function NcrContainment({ ncr, canEdit }: { ncr: NcrDetail; canEdit: boolean }) {
  const save = useUpdateContainment(ncr.number);
  const [saved, setSaved] = useState(false);
  const editable = canEdit && OPEN_NCR_STATES.includes(ncr.state);
  return (
    <Card labelledBy="ncr-containment-heading">
      <CardHeader
        id="ncr-containment-heading"
        title="Containment"
        description={
          ncr.lot
            ? 'What was done to keep the lot, and any other boxes of it, from being used.'
            : 'What was done to keep the part, and any like it, from going on.'
        }
      />
      <CardBody>
        {editable ? (
          <Form
            // a fresh form once the saved text comes back, so it starts from what is on record
            key={ncr.containment}
            schema={containmentBody}
            defaultValues={{ containment: ncr.containment }}
            onSubmit={async (body) => {
              setSaved(false);
              await save.mutateAsync(body);
              setSaved(true);
            }}
          >
            <TextAreaField
              name="containment"
              label="Containment note"
              hint={
                ncr.lot
                  ? 'For example: boxes tagged and moved to the hold rack; the build bench told not to use the lot.'
                  : 'For example: tagged and moved to the hold rack; the other blocks of the batch checked.'
              }
            />
            <div className="flex flex-wrap items-center gap-3">
              <SubmitButton variant="secondary">Save containment</SubmitButton>
              {saved && (
                <Notice tone="ok" live="status">
                  Containment saved.
                </Notice>
              )}
            </div>
          </Form>
        ) : ncr.containment ? (
          <p className="max-w-prose whitespace-pre-line">{ncr.containment}</p>
        ) : (
          <p className="text-ink-soft">No containment was recorded.</p>
        )}
      </CardBody>
    </Card>
  );
}
