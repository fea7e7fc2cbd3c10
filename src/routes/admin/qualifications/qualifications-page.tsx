import type { QueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import type { LoaderFunctionArgs } from 'react-router';
import {
  signQualificationBody,
  withdrawQualificationBody,
  type QualificationJson,
  type QualificationMatrixJson,
  type QualificationState,
} from '../../../../shared/schemas/qualifications';
import { useSignedIn, type SignedIn } from '../../../api/auth/me';
import {
  matrixQueryOptions,
  useQualificationMatrix,
  useSignQualification,
  useWithdrawQualification,
} from '../../../api/qualifications/qualifications';
import { Form, SubmitButton } from '../../../components/form';
import { SelectField, TextAreaField, TextField } from '../../../components/form-fields';
import { PageHeader } from '../../../components/page-header';
import { SignStep } from '../../../components/sign-dialog';
import { Badge, type Tone } from '../../../components/ui/badge';
import { Button } from '../../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../../components/ui/card';
import { Dialog, DialogActions } from '../../../components/ui/dialog';
import { Notice } from '../../../components/ui/notice';
import { requirePermission } from '../../../lib/session';

export const qualificationsLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'qualifications.read');
    await queryClient.ensureQueryData(matrixQueryOptions());
    return null;
  };

const STATE: Record<QualificationState | 'none', { tone: Tone; word: string }> = {
  current: { tone: 'ok', word: 'Qualified' },
  expiring: { tone: 'wait', word: 'Expiring' },
  expired: { tone: 'bad', word: 'Expired' },
  withdrawn: { tone: 'off', word: 'Withdrawn' },
  none: { tone: 'neutral', word: 'Not qualified' },
};

const addDays = (iso: string, days: number) =>
  new Date(Date.parse(`${iso}T00:00:00Z`) + days * 86_400_000).toISOString().slice(0, 10);

type Preset = { userId?: number; stage?: string };

/** Who may record which stage, and the signed sign-off that makes it so. */
export function QualificationsPage() {
  const me = useSignedIn();
  const matrix = useQualificationMatrix();
  const [preset, setPreset] = useState<Preset>({});
  const [withdrawing, setWithdrawing] = useState<QualificationJson | null>(null);
  const data = matrix.data;
  if (!data || !me) return null;
  const manage = me.can('qualifications.manage');

  return (
    <>
      <PageHeader
        title="Qualifications"
        description="Who may record which stage, from the day they were trained to the day it runs out. A station refuses a result from anyone without one in force."
      />
      <div className="flex flex-col gap-5">
        {manage && (
          <Card labelledBy="q-sign">
            <CardHeader
              id="q-sign"
              title="Sign someone off"
              description="A renewal is a new sign-off; the newest one is in force."
            />
            <CardBody>
              <SignOffForm key={`${preset.userId ?? ''}:${preset.stage ?? ''}`} preset={preset} data={data} me={me} />
            </CardBody>
          </Card>
        )}
        <Card labelledBy="q-matrix">
          <CardHeader
            id="q-matrix"
            title="People and stages"
            description={`Today is ${data.today}. “Expiring” means within ${data.warnDays} days; the expiry day is the last day covered.`}
          />
          <CardBody>
            {data.people.length === 0 ? (
              <p className="text-ink-soft">Nobody who records results yet.</p>
            ) : (
              <ul className="flex flex-col gap-5" aria-label="People and their qualifications">
                {data.people.map((p) => (
                  <li key={p.id} className="border-b border-rule pb-4 last:border-b-0">
                    <h3 className="mb-2 text-lg font-semibold">
                      {p.name} <span className="text-sm font-normal capitalize text-ink-soft">{p.role}</span>
                    </h3>
                    <ul
                      className="grid grid-cols-1 gap-2 sm:grid-cols-2 xl:grid-cols-3"
                      aria-label={`${p.name}: stages`}
                    >
                      {data.stages.map((s) => {
                        const q = p.cells[s.code];
                        const st = STATE[q?.state ?? 'none'];
                        return (
                          <li
                            key={s.code}
                            className="flex items-center justify-between gap-2 rounded-control border border-rule px-3 py-2"
                          >
                            <span className="min-w-0">
                              <span className="block font-medium">{s.name}</span>
                              <span className="flex flex-wrap items-center gap-2 text-sm">
                                <Badge tone={st.tone}>{st.word}</Badge>
                                {q && q.state !== 'withdrawn' && (
                                  <span className="font-mono text-ink-soft">to {q.expiresOn}</span>
                                )}
                              </span>
                              {q && (
                                <span className="block text-sm text-ink-soft">Signed by {q.signature.printedName}</span>
                              )}
                            </span>
                            {manage && p.id !== me.user.id && (
                              <span className="flex shrink-0 flex-col gap-1">
                                <Button
                                  size="sm"
                                  aria-label={`${q ? 'Renew' : 'Sign off'} ${p.name} for ${s.name}`}
                                  onClick={() => {
                                    setPreset({ userId: p.id, stage: s.code });
                                    window.scrollTo({ top: 0, behavior: 'smooth' });
                                  }}
                                >
                                  {q ? 'Renew' : 'Sign off'}
                                </Button>
                                {q && q.state !== 'withdrawn' && (
                                  <Button
                                    size="sm"
                                    variant="danger"
                                    aria-label={`Withdraw ${p.name} from ${s.name}`}
                                    onClick={() => setWithdrawing(q)}
                                  >
                                    Withdraw
                                  </Button>
                                )}
                              </span>
                            )}
                          </li>
                        );
                      })}
                    </ul>
                  </li>
                ))}
              </ul>
            )}
          </CardBody>
        </Card>
      </div>
      <WithdrawDialog q={withdrawing} onClose={() => setWithdrawing(null)} />
    </>
  );
}

function SignOffForm({ preset, data, me }: { preset: Preset; data: QualificationMatrixJson; me: SignedIn }) {
  const today = data.today;
  const sign = useSignQualification();
  const [done, setDone] = useState<QualificationJson | null>(null);
  return (
    <Form
      schema={signQualificationBody}
      defaultValues={{
        userId: preset.userId,
        stage: preset.stage ?? '',
        trainedOn: today,
        expiresOn: addDays(today, 365),
        reason: '',
        password: '',
      }}
      onSubmit={async (body) => {
        setDone(await sign.mutateAsync(body));
      }}
    >
      {done && (
        <Notice tone="ok" live="status">
          {done.person.name} may record {done.stage.name} until {done.expiresOn}.
        </Notice>
      )}
      <div className="grid grid-cols-1 gap-4 md:grid-cols-2">
        <SelectField
          name="userId"
          label="Person"
          numeric
          placeholder="Choose a person"
          options={data.people
            .filter((p) => p.id !== me.user.id)
            .map((p) => ({ value: String(p.id), label: `${p.name} (${p.role})` }))}
        />
        <SelectField
          name="stage"
          label="Stage"
          placeholder="Choose a stage"
          options={data.stages.map((s) => ({ value: s.code, label: s.name }))}
        />
        <TextField name="trainedOn" label="Trained on" type="date" max={today} />
        <TextField name="expiresOn" label="Expires on (last day covered)" type="date" min={today} />
      </div>
      <TextAreaField name="reason" label="Training" hint="What the training was: course, procedure and revision." />
      <SignStep
        label="Sign off"
        signer={me.user.name}
        meaning="confirm this person was trained and may record the stage until the expiry day"
        subject="the qualification"
      />
    </Form>
  );
}

function WithdrawDialog({ q, onClose }: { q: QualificationJson | null; onClose: () => void }) {
  const withdraw = useWithdrawQualification();
  return (
    <Dialog
      open={q !== null}
      onClose={onClose}
      title="Withdraw a qualification"
      description={q ? `${q.person.name} will no longer be able to record ${q.stage.name}.` : undefined}
    >
      {q && (
        <Form
          schema={withdrawQualificationBody}
          defaultValues={{ reason: '', password: '' }}
          onSubmit={async (body) => {
            await withdraw.mutateAsync({ id: q.id, ...body });
            onClose();
          }}
        >
          <TextAreaField name="reason" label="Why" />
          <TextField name="password" label="Your password (signs it)" type="password" autoComplete="current-password" />
          <DialogActions>
            <Button onClick={onClose}>Cancel</Button>
            <SubmitButton variant="danger">Withdraw</SubmitButton>
          </DialogActions>
        </Form>
      )}
    </Dialog>
  );
}
