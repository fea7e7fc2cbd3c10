import type { QueryClient } from '@tanstack/react-query';
import { Link, useParams, type LoaderFunctionArgs } from 'react-router';
import {
  FIELD_ACTION_DECISION_LABELS,
  FIELD_ACTION_DECISIONS,
  decideFieldActionBody,
  type FieldActionJson,
} from '../../../shared/schemas/field-actions';
import { useSignedIn } from '../../api/auth/me';
import { useDecideFieldAction } from '../../api/field-actions/decide-field-action';
import { fieldActionQueryOptions, useFieldAction } from '../../api/field-actions/field-action';
import { RadioGroupField } from '../../components/choice-fields';
import { Form, SubmitButton } from '../../components/form';
import { TextAreaField, TextField } from '../../components/form-fields';
import { PageHeader } from '../../components/page-header';
import { PASSWORD_HINT, SigningStatement } from '../../components/signing-statement';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Icon } from '../../components/ui/icon';
import { formatWhen } from '../../lib/format';
import { ApiError } from '../../lib/http';
import { ncrHref, trailHref } from '../../lib/paths';
import { requirePermission } from '../../lib/session';
import { FieldActionBadge } from './field-action-badge';

const NUMBER = /^FA-\d{4}-\d{5,}$/;
const canonical = (raw: string | undefined) => (raw ?? '').trim().toUpperCase();

export const fieldActionLoader =
  (queryClient: QueryClient) =>
  async ({ request, params }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'field-actions.read');
    const number = canonical(params.number);
    if (!NUMBER.test(number)) {
      throw new ApiError(400, { code: 'invalid', message: 'A field action number looks like FA-2026-00007.' });
    }
    await queryClient.ensureQueryData(fieldActionQueryOptions(number));
    return null;
  };

function Facts({ fa }: { fa: FieldActionJson }) {
  const rows: [string, React.ReactNode][] = [
    [
      'Unit',
      <Link key="u" to={trailHref(fa.unit.serial)} className="font-mono text-accent underline">
        {fa.unit.serial}
      </Link>,
    ],
    [
      'Family',
      <span key="f" className="font-mono">
        {fa.unit.familyCode}
      </span>,
    ],
    ['Customer', fa.shipment.customer ?? '—'],
    [
      'Order',
      <span key="o" className="font-mono">
        {fa.shipment.reference}
      </span>,
    ],
    [
      'Shipped',
      <span key="s" className="font-mono">
        {fa.shipment.shipDate}
      </span>,
    ],
    [
      'Opened',
      <span key="d" className="font-mono">
        {formatWhen(fa.openedAt)}
      </span>,
    ],
  ];
  return (
    <dl className="grid grid-cols-1 gap-x-6 gap-y-2 sm:grid-cols-2 lg:grid-cols-3">
      {rows.map(([k, v]) => (
        <div key={k}>
          <dt className="text-xs font-semibold uppercase tracking-wide text-ink-soft">{k}</dt>
          <dd>{v}</dd>
        </div>
      ))}
    </dl>
  );
}

function DecideForm({ fa, signer }: { fa: FieldActionJson; signer: string }) {
  const decide = useDecideFieldAction();
  return (
    <Form
      schema={decideFieldActionBody}
      defaultValues={{ reason: '', password: '' }}
      onSubmit={async (body) => {
        await decide.mutateAsync({ number: fa.number, body });
      }}
    >
      <RadioGroupField
        name="decision"
        legend="What is done in the field"
        columns={3}
        options={FIELD_ACTION_DECISIONS.map((d) => ({ value: d, label: FIELD_ACTION_DECISION_LABELS[d] }))}
        hint="Notify and recall mail the customer on file with your reason and your name."
      />
      <TextAreaField name="reason" label="Reason" hint="Why, in words the customer and an auditor will read." />
      <SigningStatement signer={signer} meaning="decide this field action" subject={fa.number} />
      <div className="max-w-sm">
        <TextField
          name="password"
          label="Password"
          type="password"
          autoComplete="current-password"
          hint={PASSWORD_HINT}
        />
      </div>
      <div className="flex justify-end">
        <SubmitButton>Sign the decision</SubmitButton>
      </div>
    </Form>
  );
}

export function FieldActionPage() {
  const me = useSignedIn();
  const { data: fa } = useFieldAction(canonical(useParams().number));
  if (!me || !fa) return null;
  return (
    <div className="mx-auto max-w-page">
      <PageHeader
        title={
          <span className="flex flex-wrap items-center gap-x-4 gap-y-2">
            <span className="font-mono tracking-wide">{fa.number}</span>
            <span className="text-base font-normal tracking-normal">
              <FieldActionBadge fa={fa} />
            </span>
          </span>
        }
        description="A problem found after this unit shipped."
      />
      <div className="flex flex-col gap-5">
        <Card labelledBy="fa-unit-heading">
          <CardHeader id="fa-unit-heading" title="The shipped unit" />
          <CardBody>
            <Facts fa={fa} />
          </CardBody>
        </Card>
        <Card labelledBy="fa-ncr-heading">
          <CardHeader
            id="fa-ncr-heading"
            title="What was found"
            description={
              <>
                <Link to={ncrHref(fa.ncr.number)} className="font-mono text-accent underline">
                  {fa.ncr.number}
                </Link>{' '}
                ({fa.ncr.severity}) on <span className="font-mono">{fa.ncr.subject}</span>, which is in this unit.
              </>
            }
          />
          <CardBody>
            <p className="max-w-prose whitespace-pre-line">{fa.ncr.description}</p>
          </CardBody>
        </Card>
        <Card labelledBy="fa-decision-heading">
          <CardHeader id="fa-decision-heading" title="Decision" />
          <CardBody>
            {fa.state === 'closed' && fa.signature ? (
              <div className="flex items-start gap-3">
                <Icon name="key" size={20} className="mt-0.5 text-accent" />
                <div>
                  <p className="text-lg font-semibold">{FIELD_ACTION_DECISION_LABELS[fa.decision!]}</p>
                  <p className="whitespace-pre-line">{fa.decisionReason}</p>
                  <p className="mt-1 text-ink-soft">
                    Signed by <span className="font-semibold text-ink">{fa.signature.printedName}</span> ·{' '}
                    {fa.signature.meaning} ·{' '}
                    <time className="font-mono" dateTime={fa.signature.signedAt}>
                      {formatWhen(fa.signature.signedAt, { seconds: true })}
                    </time>
                  </p>
                </div>
              </div>
            ) : me.can('field-actions.decide') ? (
              <DecideForm fa={fa} signer={me.user.name} />
            ) : (
              <p className="text-ink-soft">Waiting for quality to decide what is done in the field.</p>
            )}
          </CardBody>
        </Card>
      </div>
    </div>
  );
}
