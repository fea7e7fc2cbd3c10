import { useState } from 'react';
import { Link } from 'react-router';
import { createPersonBody, resetPasswordBody, updatePersonBody, type Person } from '../../../../shared/schemas/people';
import { ROLE_LABELS, ROLES } from '../../../../shared/roles';
import { useCreatePerson } from '../../../api/people/create-person';
import { useResetPersonPassword } from '../../../api/people/reset-password';
import { useUpdatePerson } from '../../../api/people/update-person';
import { ConfirmDialog } from '../../../components/confirm-dialog';
import { Form, SubmitButton } from '../../../components/form';
import { SelectField, TextField } from '../../../components/form-fields';
import { Button } from '../../../components/ui/button';
import { Dialog, DialogActions } from '../../../components/ui/dialog';
import { Notice } from '../../../components/ui/notice';
import { auditHref } from '../../../lib/paths';

const roleOptions = ROLES.map((r) => ({ value: r, label: ROLE_LABELS[r] }));
const PASSWORD_HINT = 'At least 12 characters. Hand it over in person; they can change it under Account.';

export function AddPersonDialog({ open, onClose }: { open: boolean; onClose: () => void }) {
  const create = useCreatePerson();
  return (
    <Dialog
      open={open}
      onClose={onClose}
      title="Add a person"
      description="They sign in with this e-mail and first password."
    >
      <Form
        schema={createPersonBody}
        defaultValues={{ name: '', email: '', role: 'operator', password: '' }}
        onSubmit={async (values) => {
          await create.mutateAsync(values);
          onClose();
        }}
      >
        <TextField name="name" label="Name" autoComplete="off" autoFocus />
        <TextField name="email" label="E-mail" type="email" autoComplete="off" mono />
        <SelectField
          name="role"
          label="Role"
          options={roleOptions}
          hint="One role per person; it decides which areas they see."
        />
        <TextField
          name="password"
          label="First password"
          type="password"
          autoComplete="new-password"
          hint={PASSWORD_HINT}
        />
        <DialogActions>
          <Button onClick={onClose}>Cancel</Button>
          <SubmitButton>Add person</SubmitButton>
        </DialogActions>
      </Form>
    </Dialog>
  );
}

export function EditPersonDialog({ person, self, onClose }: { person: Person; self: boolean; onClose: () => void }) {
  const update = useUpdatePerson();
  return (
    <Dialog open onClose={onClose} title={`Edit ${person.name}`} description={person.email}>
      <Form
        schema={updatePersonBody}
        defaultValues={{ name: person.name, role: person.role }}
        onSubmit={async (values) => {
          await update.mutateAsync({ id: person.id, ...values });
          onClose();
        }}
      >
        <TextField name="name" label="Name" autoComplete="off" autoFocus />
        <SelectField
          name="role"
          label="Role"
          options={roleOptions}
          disabled={self}
          hint={
            self
              ? 'You cannot change your own role; another administrator can.'
              : 'A new role takes effect on their next page.'
          }
        />
        <p className="text-sm">
          <Link
            to={auditHref({ entity: 'user', entityId: person.id })}
            className="text-accent underline underline-offset-4"
          >
            See every change to {person.name} in the audit trail
          </Link>
        </p>
        <DialogActions>
          <Button onClick={onClose}>Cancel</Button>
          <SubmitButton>Save</SubmitButton>
        </DialogActions>
      </Form>
    </Dialog>
  );
}

export function ResetPasswordDialog({ person, onClose }: { person: Person; onClose: () => void }) {
  const reset = useResetPersonPassword();
  const [done, setDone] = useState(false);
  return (
    <Dialog
      open
      onClose={onClose}
      title={`New password for ${person.name}`}
      description="This signs them out on every device."
    >
      {done ? (
        <>
          <Notice tone="ok" live="status" title="Password set">
            {person.name} is signed out everywhere and signs in next with the new password.
          </Notice>
          <DialogActions>
            <Button variant="primary" onClick={onClose}>
              Done
            </Button>
          </DialogActions>
        </>
      ) : (
        <Form
          schema={resetPasswordBody}
          defaultValues={{ password: '' }}
          onSubmit={async (values) => {
            await reset.mutateAsync({ id: person.id, ...values });
            setDone(true);
          }}
        >
          <TextField
            name="password"
            label="New password"
            type="password"
            autoComplete="new-password"
            hint={PASSWORD_HINT}
            autoFocus
          />
          <DialogActions>
            <Button onClick={onClose}>Cancel</Button>
            <SubmitButton>Set password</SubmitButton>
          </DialogActions>
        </Form>
      )}
    </Dialog>
  );
}

export function SetActiveDialog({ person, onClose }: { person: Person; onClose: () => void }) {
  const update = useUpdatePerson();
  const deactivating = person.active;
  return (
    <ConfirmDialog
      open
      title={deactivating ? `Deactivate ${person.name}?` : `Reactivate ${person.name}?`}
      confirmLabel={deactivating ? 'Deactivate' : 'Reactivate'}
      variant={deactivating ? 'danger' : 'primary'}
      busy={update.isPending}
      error={update.error}
      onClose={onClose}
      onConfirm={() => update.mutate({ id: person.id, active: !deactivating }, { onSuccess: onClose })}
    >
      {deactivating ? (
        <p>
          They are signed out at once and can no longer sign in. Everything they recorded stays on record under their
          name. You can reactivate them later.
        </p>
      ) : (
        <p>They can sign in again with their current password, as {ROLE_LABELS[person.role]}.</p>
      )}
    </ConfirmDialog>
  );
}
