import type { QueryClient } from '@tanstack/react-query';
import { useParams, type LoaderFunctionArgs } from 'react-router';
import { CA_NUMBER } from '../../../shared/schemas/corrective-action';
import { useSignedIn } from '../../api/auth/me';
import { caQueryOptions, useCa } from '../../api/corrective-actions/ca';
import { peopleQueryOptions } from '../../api/corrective-actions/people';
import { plantQueryOptions } from '../../api/plant/plant';
import { PageHeader } from '../../components/page-header';
import { ButtonLink } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Icon } from '../../components/ui/icon';
import { formatWhen } from '../../lib/format';
import { ApiError } from '../../lib/http';
import { paths } from '../../lib/paths';
import { requirePermission } from '../../lib/session';
import { Actions } from './ca-actions';
import { Closure, Verification } from './ca-closure';
import { Containment, RootCause, Sources, WrittenPart } from './ca-record';
import { Team } from './ca-team';
import { CaStateBadge } from './ca-words';

const canonical = (raw: string | undefined) => (raw ?? '').trim().toUpperCase();

export const caLoader =
  (queryClient: QueryClient) =>
  async ({ request, params }: LoaderFunctionArgs) => {
    const me = await requirePermission(queryClient, request, 'corrective-actions.read');
    const number = canonical(params.number);
    if (!CA_NUMBER.test(number)) {
      throw new ApiError(400, { code: 'invalid', message: 'A corrective action number looks like CA-2026-00007.' });
    }
    await Promise.all([
      queryClient.ensureQueryData(caQueryOptions(number)),
      queryClient.ensureQueryData(plantQueryOptions()),
      me.can('corrective-actions.manage') ? queryClient.ensureQueryData(peopleQueryOptions()) : null,
    ]);
    return null;
  };

/**
 * One corrective action, read top to bottom as the problem is worked: where it came from, who works
 * it, the problem, containment, root cause, actions, proof that it worked, and the signed closure.
 */
export function CaPage() {
  const me = useSignedIn();
  const { data: ca } = useCa(canonical(useParams().number));
  if (!me || !ca) return null;
  const editable = ca.state === 'open' && me.can('corrective-actions.manage');
  return (
    <div className="mx-auto max-w-page">
      <PageHeader
        title={
          <span className="flex flex-wrap items-center gap-x-4 gap-y-2">
            <span className="font-mono tracking-wide">{ca.number}</span>
            <span className="text-base font-normal tracking-normal">
              <CaStateBadge state={ca.state} />
            </span>
          </span>
        }
        description={
          <>
            <span className="font-semibold text-ink">{ca.title}</span> · opened{' '}
            <span className="font-mono">{formatWhen(ca.openedAt)}</span> by {ca.openedBy}
          </>
        }
        actions={<ButtonLink to={paths.correctiveActions}>All corrective actions</ButtonLink>}
      />
      <div className="grid grid-cols-1 items-start gap-5 xl:grid-cols-[minmax(0,1fr)_24rem]">
        <div className="flex flex-col gap-5">
          <Card labelledBy="ca-problem">
            <CardHeader
              id="ca-problem"
              title="The problem"
              description="What, where, when and how many: the facts, before any cause."
            />
            <CardBody>
              <WrittenPart
                ca={ca}
                field="problem"
                label="Problem statement"
                empty="Not written yet."
                hint="What, where, when, how many."
                editable={editable}
              />
            </CardBody>
          </Card>
          <Containment ca={ca} editable={editable} />
          <RootCause ca={ca} editable={editable} />
          <Actions ca={ca} me={me} editable={editable} />
          <Verification ca={ca} editable={editable} />
          <Closure ca={ca} me={me} />
        </div>
        <div className="flex flex-col gap-5">
          <Sources ca={ca} editable={editable} />
          <Team ca={ca} editable={editable} />
          <Card labelledBy="ca-signatures">
            <CardHeader id="ca-signatures" title="Signatures" />
            <CardBody>
              {ca.signatures.length ? (
                <ol className="flex flex-col gap-3">
                  {ca.signatures.map((s) => (
                    <li key={`${s.signedAt}-${s.meaning}`} className="flex items-start gap-2.5">
                      <Icon name="key" size={18} className="mt-0.5 shrink-0 text-accent" />
                      <span>
                        <span className="font-semibold">{s.meaning}</span>
                        <span className="block text-sm text-ink-soft">
                          {s.printedName} ·{' '}
                          <time className="font-mono" dateTime={s.signedAt}>
                            {formatWhen(s.signedAt, { seconds: true })}
                          </time>
                        </span>
                      </span>
                    </li>
                  ))}
                </ol>
              ) : (
                <p className="text-ink-soft">None yet: quality signs the closure.</p>
              )}
            </CardBody>
          </Card>
        </div>
      </div>
    </div>
  );
}
