import { useState } from 'react';
import { useFieldArray, useFormContext } from 'react-hook-form';
import { z } from 'zod';
import type { CaJson } from '../../../shared/schemas/corrective-action';
import { ROLE_LABELS, type Role } from '../../../shared/roles';
import { usePeople } from '../../api/corrective-actions/people';
import { useSetTeam } from '../../api/corrective-actions/set-team';
import { Form, SubmitButton } from '../../components/form';
import { Button } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Dialog, DialogActions } from '../../components/ui/dialog';
import { Input } from '../../components/ui/input';

const roleWord = (r: string) => ROLE_LABELS[r as Role] ?? r;

const teamForm = z.object({
  people: z.array(z.object({ userId: z.number(), name: z.string(), on: z.boolean(), role: z.string().trim().max(80) })),
});
type TeamForm = z.input<typeof teamForm>;

function Rows() {
  const { control, register } = useFormContext<TeamForm>();
  const rows = useFieldArray({ control, name: 'people' });
  return (
    <ul className="flex max-h-[55vh] flex-col divide-y divide-rule overflow-auto">
      {rows.fields.map((p, i) => (
        <li key={p.id} className="grid grid-cols-1 items-center gap-2 py-2 sm:grid-cols-[minmax(0,1fr)_14rem]">
          <label className="flex min-h-11 floor:min-h-12 items-center gap-2.5">
            <input type="checkbox" className="size-5 accent-accent" {...register(`people.${i}.on`)} />
            {p.name}
          </label>
          <Input
            aria-label={`Role of ${p.name} on the team`}
            placeholder="Role on the team"
            {...register(`people.${i}.role`)}
          />
        </li>
      ))}
    </ul>
  );
}

function TeamDialog({ ca, onClose }: { ca: CaJson; onClose: () => void }) {
  const people = usePeople();
  const set = useSetTeam();
  const current = new Map(ca.team.map((m) => [m.userId, m.teamRole]));
  return (
    <Dialog
      open
      onClose={onClose}
      width="wide"
      title="The team"
      description="Anyone added is mailed that they are on it."
    >
      <Form
        schema={teamForm}
        defaultValues={{
          people: (people.data ?? []).map((p) => ({
            userId: p.id,
            name: `${p.name} (${roleWord(p.role)})`,
            on: current.has(p.id),
            role: current.get(p.id) ?? '',
          })),
        }}
        onSubmit={async (v) => {
          await set.mutateAsync({
            number: ca.number,
            body: { members: v.people.filter((p) => p.on).map((p) => ({ userId: p.userId, role: p.role })) },
          });
          onClose();
        }}
      >
        <Rows />
        <DialogActions>
          <Button onClick={onClose}>Cancel</Button>
          <SubmitButton>Save the team</SubmitButton>
        </DialogActions>
      </Form>
    </Dialog>
  );
}

export function Team({ ca, editable }: { ca: CaJson; editable: boolean }) {
  const [open, setOpen] = useState(false);
  return (
    <Card labelledBy="ca-team">
      <CardHeader
        id="ca-team"
        title="Team"
        description="The people who work the problem through."
        actions={
          editable && (
            <Button size="sm" onClick={() => setOpen(true)}>
              Change the team
            </Button>
          )
        }
      />
      <CardBody>
        {ca.team.length ? (
          <ul className="flex flex-col gap-1.5">
            {ca.team.map((m) => (
              <li key={m.userId}>
                <span className="font-medium">{m.name}</span>{' '}
                <span className="text-ink-soft">
                  {roleWord(m.role)}
                  {m.teamRole ? ` · ${m.teamRole}` : ''}
                </span>
              </li>
            ))}
          </ul>
        ) : (
          <p className="text-ink-soft">Nobody yet.</p>
        )}
      </CardBody>
      {open && <TeamDialog ca={ca} onClose={() => setOpen(false)} />}
    </Card>
  );
}
