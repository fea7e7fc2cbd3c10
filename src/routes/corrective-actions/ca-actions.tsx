import { useState } from 'react';
import {
  TASK_KIND_LABELS,
  TASK_KINDS,
  taskBody,
  taskDoneBody,
  type CaJson,
  type TaskJson,
} from '../../../shared/schemas/corrective-action';
import type { SignedIn } from '../../api/auth/me';
import { useAddAction } from '../../api/corrective-actions/add-action';
import { useCompleteAction } from '../../api/corrective-actions/complete-action';
import { usePeople } from '../../api/corrective-actions/people';
import { usePlant } from '../../api/plant/plant';
import { RadioGroupField } from '../../components/choice-fields';
import { Form, SubmitButton } from '../../components/form';
import { SelectField, TextAreaField, TextField } from '../../components/form-fields';
import { Button } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Dialog, DialogActions } from '../../components/ui/dialog';
import { EmptyRow, Table, TBody, TD, TH, THead, TR } from '../../components/ui/table';
import { formatWhen } from '../../lib/format';
import { TaskStateBadge } from './ca-words';

function DoneDialog({ ca, task, onClose }: { ca: CaJson; task: TaskJson; onClose: () => void }) {
  const done = useCompleteAction();
  return (
    <Dialog open onClose={onClose} title="Mark the action done" description={`${ca.number}: ${task.description}`}>
      <Form
        schema={taskDoneBody}
        defaultValues={{ note: '' }}
        onSubmit={async ({ note }) => {
          await done.mutateAsync({ number: ca.number, id: task.id, note });
          onClose();
        }}
      >
        <TextAreaField
          name="note"
          label="What was done"
          hint="Where the proof is: a drawing, a revised rule, a record."
        />
        <DialogActions>
          <Button onClick={onClose}>Cancel</Button>
          <SubmitButton>Mark done</SubmitButton>
        </DialogActions>
      </Form>
    </Dialog>
  );
}

function AddAction({ ca }: { ca: CaJson }) {
  const add = useAddAction();
  const people = usePeople();
  const plant = usePlant();
  const [round, setRound] = useState(0);
  return (
    <Form
      key={round}
      schema={taskBody}
      defaultValues={{ description: '', dueOn: '' }}
      onSubmit={async (body) => {
        await add.mutateAsync({ number: ca.number, body });
        setRound((r) => r + 1);
      }}
    >
      <h3 className="font-semibold">Add an action</h3>
      <RadioGroupField
        name="kind"
        legend="Kind"
        options={TASK_KINDS.map((k) => ({ value: k, label: TASK_KIND_LABELS[k] }))}
      />
      <TextAreaField name="description" label="What is to be done" />
      <div className="grid grid-cols-1 gap-4 md:grid-cols-2">
        <SelectField
          name="ownerId"
          label="Owner"
          numeric
          placeholder="Choose…"
          hint="Mailed at once, and each day once it is overdue."
          options={(people.data ?? []).map((p) => ({ value: String(p.id), label: p.name }))}
        />
        <TextField name="dueOn" label="Due on" type="date" min={plant.data?.today} />
      </div>
      <div className="flex justify-end">
        <SubmitButton>Add the action</SubmitButton>
      </div>
    </Form>
  );
}

/** Corrective and preventive actions, each with its owner and due date; the owner or quality marks it done. */
export function Actions({ ca, me, editable }: { ca: CaJson; me: SignedIn; editable: boolean }) {
  const [doing, setDoing] = useState<TaskJson | null>(null);
  const manages = me.can('corrective-actions.manage');
  return (
    <Card labelledBy="ca-actions">
      <CardHeader
        id="ca-actions"
        title="Actions"
        description="Corrective actions remove the cause; preventive ones stop it happening elsewhere."
      />
      <div className="overflow-x-auto">
        <Table caption="Actions">
          <THead>
            <TR>
              <TH>Kind</TH>
              <TH>Action</TH>
              <TH>Owner</TH>
              <TH>Due</TH>
              <TH>State</TH>
              <TH>
                <span className="sr-only">Mark done</span>
              </TH>
            </TR>
          </THead>
          <TBody>
            {ca.actions.length ? (
              ca.actions.map((t) => (
                <TR key={t.id}>
                  <TD nowrap>{t.kind === 'corrective' ? 'Corrective' : 'Preventive'}</TD>
                  <TD>
                    {t.description}
                    {t.doneNote && (
                      <span className="block text-sm text-ink-soft">
                        Done: {t.doneNote} ({t.doneBy}, <span className="font-mono">{formatWhen(t.doneAt)}</span>)
                      </span>
                    )}
                  </TD>
                  <TD nowrap>{t.owner.name}</TD>
                  <TD mono nowrap>
                    {t.dueOn}
                  </TD>
                  <TD nowrap>
                    <TaskStateBadge t={t} />
                  </TD>
                  <TD align="right" nowrap>
                    {!t.doneAt && ca.state === 'open' && (manages || t.owner.id === me.user.id) && (
                      <Button size="sm" onClick={() => setDoing(t)} aria-label={`Mark done: ${t.description}`}>
                        Mark done
                      </Button>
                    )}
                  </TD>
                </TR>
              ))
            ) : (
              <EmptyRow colSpan={6}>No actions yet.</EmptyRow>
            )}
          </TBody>
        </Table>
      </div>
      {editable && (
        <CardBody>
          <AddAction ca={ca} />
        </CardBody>
      )}
      {doing && <DoneDialog ca={ca} task={doing} onClose={() => setDoing(null)} />}
    </Card>
  );
}
