import { useNavigate } from 'react-router';
import { z } from 'zod';
import { changePasswordBody } from '../../../shared/schemas/auth';
import { ROLE_LABELS } from '../../../shared/roles';
import { useChangePassword } from '../../api/auth/change-password';
import { useSignedIn } from '../../api/auth/me';
import { Form, SubmitButton } from '../../components/form';
import { TextField } from '../../components/form-fields';
import { PageHeader } from '../../components/page-header';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { signInHref } from '../../lib/paths';
import { SecondFactorCard } from './second-factor-card';
import { PreferencesCard } from './preferences-card';
import { SessionsCard } from './sessions-card';

// the server's schema, plus a second typing of the new password that never leaves the browser
const changePasswordForm = changePasswordBody
  .extend({ confirmPassword: z.string() })
  .refine((v) => v.confirmPassword === v.newPassword, {
    message: 'The two new passwords differ.',
    path: ['confirmPassword'],
  });

export function AccountPage() {
  const me = useSignedIn();
  const change = useChangePassword();
  const navigate = useNavigate();
  if (!me) return null;
  const { user } = me;

  return (
    <>
      <PageHeader
        title="Your account"
        description="Who Coretrail knows you as, your password, your second factor and where you are signed in."
      />
      <div className="grid grid-cols-1 items-start gap-5 lg:grid-cols-[minmax(0,1fr)_minmax(0,1.2fr)]">
        <Card labelledBy="you-heading">
          <CardHeader id="you-heading" title="You" description="An administrator changes your name or role." />
          <CardBody>
            <dl className="grid grid-cols-[8rem_1fr] gap-y-2.5">
              <dt className="text-ink-soft">Name</dt>
              <dd className="font-medium">{user.name}</dd>
              <dt className="text-ink-soft">E-mail</dt>
              <dd className="font-mono text-[0.95rem]">{user.email}</dd>
              <dt className="text-ink-soft">Role</dt>
              <dd>{ROLE_LABELS[user.role]}</dd>
            </dl>
          </CardBody>
        </Card>
        <Card labelledBy="password-heading">
          <CardHeader
            id="password-heading"
            title="Change your password"
            description="This signs you out everywhere, this browser included; sign in again with the new one."
          />
          <CardBody>
            <Form
              schema={changePasswordForm}
              defaultValues={{ currentPassword: '', newPassword: '', confirmPassword: '' }}
              onSubmit={async ({ currentPassword, newPassword }) => {
                await change.mutateAsync({ currentPassword, newPassword });
                await navigate(signInHref({ note: 'password-changed' }), { replace: true });
              }}
            >
              <TextField
                name="currentPassword"
                label="Current password"
                type="password"
                autoComplete="current-password"
              />
              <TextField
                name="newPassword"
                label="New password"
                type="password"
                autoComplete="new-password"
                hint="At least 12 characters. A short sentence is easier to remember than a jumble."
              />
              <TextField
                name="confirmPassword"
                label="New password again"
                type="password"
                autoComplete="new-password"
              />
              <div>
                <SubmitButton>Change password</SubmitButton>
              </div>
            </Form>
          </CardBody>
        </Card>
        <PreferencesCard user={me.user} />
        <SecondFactorCard />
        <SessionsCard />
      </div>
    </>
  );
}
