import { useState } from 'react';
import {
  approveChangeBody,
  type PartKindJson,
  type ProcessStageJson,
  type RouteVersionJson,
} from '../../../../shared/schemas/process';
import { useApproveRoute, useDraftRoute } from '../../../api/process/mutations';
import { Form, SubmitButton } from '../../../components/form';
import { TextAreaField, TextField } from '../../../components/form-fields';
import { Button } from '../../../components/ui/button';
import { Dialog, DialogActions } from '../../../components/ui/dialog';
import { Field } from '../../../components/ui/field';
import { Checkbox } from '../../../components/ui/input';
import { Notice } from '../../../components/ui/notice';
import { Select } from '../../../components/ui/select';
import { ApiError } from '../../../lib/http';

type Step = { stage: string; required: boolean; reworkTo: string | null };

/** The next version of a route: its stages in order, each required or optional, with any rework loop. */
export function DraftRouteDialog({
  family,
  kinds,
  stages,
  start,
  onClose,
}: {
  family: string;
  kinds: PartKindJson[];
  stages: ProcessStageJson[];
  start: RouteVersionJson | null;
  onClose: () => void;
}) {
  const draft = useDraftRoute();
  const [partKind, setPartKind] = useState(start?.partKind ?? '');
  const [steps, setSteps] = useState<Step[]>(
    start?.steps.map((s) => ({ stage: s.stage, required: s.required, reworkTo: s.reworkTo })) ?? [],
  );
  const [note, setNote] = useState('');
  const usable = stages.filter((s) => !s.retired && s.partKind === partKind);
  const set = (i: number, change: Partial<Step>) =>
    setSteps((all) => all.map((s, k) => (k === i ? { ...s, ...change } : s)));
  const move = (i: number, by: number) =>
    setSteps((all) => {
      const next = [...all];
      const [row] = next.splice(i, 1);
      next.splice(i + by, 0, row!);
      return next;
    });
  const fields = draft.error instanceof ApiError ? draft.error.fields : {};

  return (
    <Dialog open onClose={onClose} title={`Draft a route for ${family}`} width="wide">
      <form
        noValidate
        className="flex flex-col gap-4"
        onSubmit={(e) => {
          e.preventDefault();
          draft.mutate({ family, partKind, note, steps }, { onSuccess: onClose });
        }}
      >
        {draft.error && (
          <Notice tone="bad" live="alert">
            {draft.error.message}
          </Notice>
        )}
        <Field id="route-kind" label="Part kind" error={fields.partKind}>
          <Select
            id="route-kind"
            value={partKind}
            placeholder="Choose a part kind"
            disabled={!!start}
            options={kinds.filter((k) => !k.retired).map((k) => ({ value: k.code, label: k.name }))}
            onChange={(e) => {
              setPartKind(e.target.value);
              setSteps([]);
            }}
          />
        </Field>
        <ol className="flex flex-col gap-3" aria-label="Stages in order">
          {steps.map((s, i) => (
            <li key={i} className="flex flex-wrap items-end gap-3 rounded-card border border-rule p-3">
              <Field id={`step-${i}`} label={`Stage ${i + 1}`} error={fields[`steps.${i}.stage`]}>
                <Select
                  id={`step-${i}`}
                  value={s.stage}
                  placeholder="Choose a stage"
                  options={usable.map((u) => ({ value: u.code, label: `${u.name} (${u.code})` }))}
                  onChange={(e) => set(i, { stage: e.target.value })}
                />
              </Field>
              <label className="flex min-h-12 items-center gap-2">
                <Checkbox checked={s.required} onChange={(e) => set(i, { required: e.target.checked })} />
                Required
              </label>
              <Field id={`rework-${i}`} label="On failure, back to" error={fields[`steps.${i}.reworkTo`]}>
                <Select
                  id={`rework-${i}`}
                  value={s.reworkTo ?? ''}
                  placeholder="No rework loop"
                  options={steps.slice(0, i).map((p) => ({ value: p.stage, label: p.stage }))}
                  onChange={(e) => set(i, { reworkTo: e.target.value || null })}
                />
              </Field>
              <span className="flex gap-1">
                <Button size="sm" disabled={i === 0} aria-label={`Move stage ${i + 1} up`} onClick={() => move(i, -1)}>
                  Up
                </Button>
                <Button
                  size="sm"
                  aria-label={`Remove stage ${i + 1}`}
                  onClick={() => setSteps((all) => all.filter((_, k) => k !== i))}
                >
                  Remove
                </Button>
              </span>
            </li>
          ))}
        </ol>
        <div>
          <Button
            disabled={!partKind}
            onClick={() => setSteps((all) => [...all, { stage: '', required: true, reworkTo: null }])}
          >
            Add a stage
          </Button>
        </div>
        <Field id="route-note" label="What changes and why">
          <textarea
            id="route-note"
            className="min-h-20 rounded border border-rule-strong p-2"
            value={note}
            onChange={(e) => setNote(e.target.value)}
          />
        </Field>
        <DialogActions>
          <Button onClick={onClose}>Cancel</Button>
          <Button type="submit" variant="primary" disabled={draft.isPending || !steps.length}>
            Save draft
          </Button>
        </DialogActions>
      </form>
    </Dialog>
  );
}

/** Approval is a signature: the approver's password again, a reason, and when the version takes effect. */
export function ApproveRouteDialog({ route, onClose }: { route: RouteVersionJson; onClose: () => void }) {
  const approve = useApproveRoute();
  return (
    <Dialog open onClose={onClose} title={`Approve ${route.family} ${route.partKind} route, version ${route.version}`}>
      <Form
        schema={approveChangeBody}
        defaultValues={{ reason: '', password: '' }}
        onSubmit={async (v) => {
          await approve.mutateAsync({ id: route.id, ...v });
          onClose();
        }}
      >
        <p>
          Parts already on an earlier version keep it. New parts start on this version from the time it takes effect.
        </p>
        <TextAreaField name="reason" label="Reason" />
        <TextField
          name="effectiveFrom"
          label="Takes effect (leave empty for now)"
          optional
          placeholder="2026-12-24T06:00:00Z"
        />
        <TextField name="password" label="Your password, to sign" type="password" autoComplete="current-password" />
        <DialogActions>
          <Button onClick={onClose}>Cancel</Button>
          <SubmitButton>Approve and sign</SubmitButton>
        </DialogActions>
      </Form>
    </Dialog>
  );
}
