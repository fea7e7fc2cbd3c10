import type { QueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import type { LoaderFunctionArgs } from 'react-router';
import { plantBody } from '../../../../shared/schemas/plant';
import { plantQueryOptions, usePlant } from '../../../api/plant/plant';
import { useUpdatePlant } from '../../../api/plant/update-plant';
import { Form, SubmitButton } from '../../../components/form';
import { NumberField, TextField } from '../../../components/form-fields';
import { PageHeader } from '../../../components/page-header';
import { Card, CardBody, CardHeader } from '../../../components/ui/card';
import { Notice } from '../../../components/ui/notice';
import { requirePermission } from '../../../lib/session';

export const plantLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'plant.manage');
    await queryClient.ensureQueryData(plantQueryOptions());
    return null;
  };

/** The plant's identity on its documents, and the calendar its dates are kept in. */
export function PlantPage() {
  const plant = usePlant();
  const update = useUpdatePlant();
  const [saved, setSaved] = useState(false);
  if (!plant.data) return null;
  return (
    <div className="mx-auto max-w-3xl">
      <PageHeader
        title="Plant"
        description="Its name and address appear on build records and certificates; its time zone decides which day a ship date, a due date and a warranty's last day fall on."
      />
      <Card labelledBy="plant-heading">
        <CardHeader id="plant-heading" title="The plant" description={`Today at the plant: ${plant.data.today}.`} />
        <CardBody>
          {saved && (
            <div className="mb-4">
              <Notice tone="ok">Saved. The change is in the audit trail.</Notice>
            </div>
          )}
          <Form
            schema={plantBody}
            defaultValues={{
              name: plant.data.name,
              address: plant.data.address,
              timeZone: plant.data.timeZone,
              ncrOverdueDays: plant.data.ncrOverdueDays,
              holdAlertHours: plant.data.holdAlertHours,
            }}
            onSubmit={async (body) => {
              await update.mutateAsync(body);
              setSaved(true);
            }}
          >
            <TextField name="name" label="Name" />
            <TextField name="address" label="Address" hint="One line, as it should print on documents." />
            <TextField
              name="timeZone"
              label="Time zone"
              mono
              hint="A time zone name such as America/Chicago or Europe/Berlin."
            />
            <NumberField
              name="ncrOverdueDays"
              label="An open NCR is overdue after"
              unit="days"
              integer
              hint="The homes of quality and supervisors show an alert for it."
            />
            <NumberField name="holdAlertHours" label="A hold is shown as an alert after" unit="hours" integer />
            <div className="flex justify-end">
              <SubmitButton>Save</SubmitButton>
            </div>
          </Form>
        </CardBody>
      </Card>
    </div>
  );
}
