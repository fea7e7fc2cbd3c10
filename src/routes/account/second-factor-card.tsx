import { useState } from 'react';
import { removeSecondFactorBody } from '../../../shared/schemas/auth';
import { useRemoveSecondFactor, useSecondFactor } from '../../api/auth/second-factor';
import { Form, SubmitButton } from '../../components/form';
import { TextField } from '../../components/form-fields';
import { Badge } from '../../components/ui/badge';
import { Button, ButtonLink } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { paths } from '../../lib/paths';

/** Your second factor: on or off, recovery codes left, set up or (where optional) turn off. */
export function SecondFactorCard() {
  const status = useSecondFactor();
  const remove = useRemoveSecondFactor();
  const [removing, setRemoving] = useState(false);
  const s = status.data;

  return (
    <Card labelledBy="factor-heading">
      <CardHeader
        id="factor-heading"
        title="Second factor"
        description={
          s?.required
            ? 'Administrators sign in with a code from an authenticator app as well as the password.'
            : 'Optional: a code from an authenticator app as well as the password.'
        }
      />
      <CardBody>
        {s && (
          <div className="flex flex-col gap-3">
            <p className="flex items-center gap-2">
              {s.enrolled ? <Badge tone="ok">On</Badge> : <Badge tone="off">Off</Badge>}
              {s.enrolled && (
                <span className="text-ink-soft">
                  {s.recoveryCodesLeft} of 10 recovery codes left
                  {s.recoveryCodesLeft <= 3
                    ? ': ask an administrator to reset it and set it up again for new ones.'
                    : '.'}
                </span>
              )}
            </p>
            {!s.enrolled && (
              <div>
                <ButtonLink to={paths.secondFactor} variant="primary">
                  Set up a second factor
                </ButtonLink>
              </div>
            )}
            {s.enrolled && !s.required && !removing && (
              <div>
                <Button onClick={() => setRemoving(true)}>Turn it off…</Button>
              </div>
            )}
            {removing && (
              <Form
                schema={removeSecondFactorBody}
                defaultValues={{ password: '' }}
                onSubmit={async ({ password }) => {
                  await remove.mutateAsync(password);
                  setRemoving(false);
                }}
              >
                <TextField name="password" label="Your password" type="password" autoComplete="current-password" />
                <div className="flex gap-2">
                  <SubmitButton variant="danger">Turn the second factor off</SubmitButton>
                  <Button onClick={() => setRemoving(false)}>Keep it</Button>
                </div>
              </Form>
            )}
          </div>
        )}
      </CardBody>
    </Card>
  );
}
