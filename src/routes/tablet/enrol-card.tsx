import { useQuery, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { can } from '../../../shared/permissions';
import { enrolTabletBody } from '../../../shared/schemas/tablets';
import { meQueryOptions } from '../../api/auth/me';
import { signOut } from '../../api/auth/sign-out';
import { stationsQueryOptions } from '../../api/reference/stations';
import { enrolTablet } from '../../api/station/tablet';
import { Form, SubmitButton } from '../../components/form';
import { SelectField, TextField } from '../../components/form-fields';
import { Card, CardBody, CardHeader } from '../../components/ui/card';

/**
 * An admin signed in on this device enrols it to a station. The admin's own session on the device
 * then ends, so the tablet's sign-in is all that is left on it.
 */
export function EnrolCard({ onEnrolled }: { onEnrolled: () => void }) {
  const queryClient = useQueryClient();
  const me = useQuery({ ...meQueryOptions(), retry: false });
  const admin = me.data && can(me.data.user.role, 'stations.manage');
  const stations = useQuery({ ...stationsQueryOptions(), enabled: Boolean(admin) });
  const [done, setDone] = useState(false);
  if (!admin || done) return null;
  return (
    <Card labelledBy="enrol-heading">
      <CardHeader
        id="enrol-heading"
        title="Enrol this device as a station tablet"
        description="Your own sign-in on this device ends once it is enrolled."
      />
      <CardBody>
        <Form
          schema={enrolTabletBody}
          defaultValues={{ station: '', label: '' }}
          onSubmit={async (body) => {
            await enrolTablet(body);
            await signOut();
            setDone(true);
            queryClient.clear();
            onEnrolled();
          }}
        >
          <div className="grid grid-cols-1 gap-4 sm:grid-cols-2">
            <SelectField
              name="station"
              label="Station"
              placeholder="Choose a station"
              options={(stations.data ?? [])
                .filter((s) => s.active && s.stageCode)
                .map((s) => ({ value: s.code, label: `${s.code} · ${s.name}` }))}
            />
            <TextField name="label" label="Name for this tablet" hint="E.g. “Bore and hone, left”." />
          </div>
          <div className="flex justify-end">
            <SubmitButton size="lg">Enrol this device</SubmitButton>
          </div>
        </Form>
      </CardBody>
    </Card>
  );
}
