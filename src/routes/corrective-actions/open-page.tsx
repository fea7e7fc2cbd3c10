import type { QueryClient } from '@tanstack/react-query';
import { useNavigate, useSearchParams, type LoaderFunctionArgs } from 'react-router';
import { z } from 'zod';
import { openCaBody } from '../../../shared/schemas/corrective-action';
import { ROLE_LABELS } from '../../../shared/roles';
import { useOpenCa } from '../../api/corrective-actions/open-ca';
import { peopleQueryOptions, usePeople } from '../../api/corrective-actions/people';
import { CheckboxListField } from '../../components/choice-fields';
import { Form, SubmitButton } from '../../components/form';
import { TextAreaField, TextField } from '../../components/form-fields';
import { PageHeader } from '../../components/page-header';
import { Card, CardBody } from '../../components/ui/card';
import { caHref } from '../../lib/paths';
import { requirePermission } from '../../lib/session';

export const openCaLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'corrective-actions.manage');
    await queryClient.ensureQueryData(peopleQueryOptions());
    return null;
  };

/** Numbers typed or pasted in one box, split on spaces, commas or new lines. */
const numbers = (pattern: RegExp, message: string) =>
  z
    .string()
    .transform((s) =>
      s
        .split(/[\s,;]+/)
        .map((x) => x.trim().toUpperCase())
        .filter(Boolean),
    )
    .pipe(z.array(z.string().regex(pattern, message)).max(50, 'At most 50.'));

const openForm = z
  .object({
    title: openCaBody.shape.title,
    problem: openCaBody.shape.problem,
    ncrs: numbers(/^NC-\d{4}-\d{5,}$/, 'An NCR number looks like NC-2026-00007.'),
    claims: numbers(/^WC-\d{4}-\d{5,}$/, 'A claim number looks like WC-2026-00007.'),
    team: z.array(z.string()).max(20, 'At most 20 people.'),
  })
  .refine((b) => b.ncrs.length + b.claims.length > 0, {
    message: 'Open it from at least one NCR or claim.',
    path: ['ncrs'],
  });

/** Quality opens a corrective action from the NCRs and claims in hand (the links that lead here fill them in). */
export function OpenCaPage() {
  const [params] = useSearchParams();
  const people = usePeople();
  const open = useOpenCa();
  const navigate = useNavigate();
  return (
    <div className="mx-auto max-w-4xl">
      <PageHeader
        title="Open a corrective action"
        description="One record for a problem that one or many NCRs and claims share. The rest of it (containment, root cause, actions, the check that it worked) is written on its page."
      />
      <Card as="div">
        <CardBody>
          <Form
            schema={openForm}
            defaultValues={{
              title: '',
              problem: '',
              ncrs: params.getAll('ncr').join(' '),
              claims: params.getAll('claim').join(' '),
              team: [],
            }}
            onSubmit={async (v) => {
              const ca = await open.mutateAsync({
                title: v.title,
                problem: v.problem,
                ncrs: v.ncrs,
                claims: v.claims,
                team: v.team.map((id) => ({ userId: Number(id), role: '' })),
              });
              await navigate(caHref(ca.number));
            }}
          >
            <TextField name="title" label="The problem in a line" hint="What went wrong, as everyone will call it." />
            <div className="grid grid-cols-1 gap-4 md:grid-cols-2">
              <TextField name="claims" label="Claims" mono hint="Claim numbers, separated by spaces." />
              <TextField name="ncrs" label="NCRs" mono hint="NCR numbers, separated by spaces." />
            </div>
            <TextAreaField
              name="problem"
              label="Problem statement"
              hint="What, where, when, how many: the facts, before any cause. It can be written later on its page."
            />
            <CheckboxListField
              name="team"
              legend="Team"
              columns={3}
              hint="Each is mailed that they are on it. Roles on the team are set on its page."
              options={(people.data ?? []).map((p) => ({
                value: String(p.id),
                label: `${p.name} (${ROLE_LABELS[p.role as keyof typeof ROLE_LABELS] ?? p.role})`,
              }))}
            />
            <div className="flex justify-end">
              <SubmitButton size="lg">Open the corrective action</SubmitButton>
            </div>
          </Form>
        </CardBody>
      </Card>
    </div>
  );
}
