import type { QueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { useSearchParams, type LoaderFunctionArgs } from 'react-router';
import type { RouteVersionJson } from '../../../../shared/schemas/process';
import { useDiscardRoute, useRetireCastingNumber } from '../../../api/process/mutations';
import {
  partKindsQueryOptions,
  processStagesQueryOptions,
  useCastingNumbers,
  usePartKinds,
  useProcessStages,
  useRouteComparison,
  useRouteVersions,
} from '../../../api/process/queries';
import { familiesQueryOptions, useFamilies } from '../../../api/reference/families';
import { PageHeader } from '../../../components/page-header';
import { Badge } from '../../../components/ui/badge';
import { Button } from '../../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../../components/ui/card';
import { Field } from '../../../components/ui/field';
import { Notice } from '../../../components/ui/notice';
import { Select } from '../../../components/ui/select';
import { useSignedIn } from '../../../api/auth/me';
import { requirePermission } from '../../../lib/session';
import { AddCastingNumberDialog } from './process-dialogs';
import { ApproveRouteDialog, DraftRouteDialog } from './route-dialogs';

export const routesLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'process.edit');
    await Promise.all([
      queryClient.ensureQueryData(familiesQueryOptions()),
      queryClient.ensureQueryData(partKindsQueryOptions()),
      queryClient.ensureQueryData(processStagesQueryOptions()),
    ]);
    return null;
  };

const STATUS: Record<RouteVersionJson['status'], { label: string; tone: 'ok' | 'wait' | 'off' | 'neutral' }> = {
  draft: { label: 'Draft', tone: 'wait' },
  approved: { label: 'Approved', tone: 'ok' },
  superseded: { label: 'Superseded', tone: 'neutral' },
  discarded: { label: 'Discarded draft', tone: 'off' },
  retired: { label: 'Retired', tone: 'off' },
};

function VersionCard({
  v,
  canApprove,
  mine,
  onApprove,
  onNext,
  onCompare,
}: {
  v: RouteVersionJson;
  canApprove: boolean;
  /** The signed-in person drafted it: the server refuses their approval, so it is not offered. */
  mine: boolean;
  onApprove: () => void;
  onNext: () => void;
  onCompare: () => void;
}) {
  const discard = useDiscardRoute();
  const s = STATUS[v.status];
  return (
    <li className="rounded-card border border-rule p-3">
      <div className="flex flex-wrap items-center gap-2">
        <h3 className="font-semibold">Version {v.version}</h3>
        <Badge tone={s.tone}>{s.label}</Badge>
        {v.inForce && <Badge tone="accent">In force</Badge>}
        <span className="text-sm text-ink-soft">
          {v.parts} part{v.parts === 1 ? '' : 's'} on it
          {v.approvedBy && ` · approved by ${v.approvedBy}`}
          {v.effectiveFrom && ` · from ${new Date(v.effectiveFrom).toLocaleString()}`}
        </span>
      </div>
      <ol className="mt-2 list-decimal pl-6">
        {v.steps.map((st) => (
          <li key={st.position}>
            {st.stageName} <span className="font-mono text-sm text-ink-faint">{st.stage}</span>
            {!st.required && ' (optional)'}
            {st.reworkTo && ` — on failure back to ${st.reworkTo}`}
          </li>
        ))}
      </ol>
      <div className="mt-2 flex flex-wrap gap-2">
        {v.status === 'draft' && canApprove && !mine && (
          <Button size="sm" variant="primary" onClick={onApprove}>
            Approve version {v.version}
          </Button>
        )}
        {v.status === 'draft' && mine && (
          <p className="flex min-h-8 items-center text-sm text-ink-soft">Someone else approves this draft.</p>
        )}
        {v.status === 'draft' && (
          <Button size="sm" onClick={() => discard.mutate(v.id)}>
            Discard draft
          </Button>
        )}
        {v.status !== 'draft' && v.status !== 'discarded' && (
          <Button size="sm" onClick={onNext}>
            Draft the next version
          </Button>
        )}
        <Button size="sm" onClick={onCompare}>
          Compare
        </Button>
      </div>
    </li>
  );
}

function Comparison({ a, b }: { a: number; b: number }) {
  const cmp = useRouteComparison(a, b);
  if (cmp.error) return <Notice tone="bad">{cmp.error.message}</Notice>;
  if (!cmp.data) return <p aria-busy="true">Comparing…</p>;
  const { left, right, rows } = cmp.data;
  const step = (s: (typeof rows)[number]['left']) =>
    s ? `${s.position}. ${s.stageName}${s.required ? '' : ' (optional)'}${s.reworkTo ? ` ↺ ${s.reworkTo}` : ''}` : '—';
  return (
    <table className="w-full text-left">
      <caption className="sr-only">
        Version {left.version} beside version {right.version}
      </caption>
      <thead>
        <tr>
          <th scope="col">Version {left.version}</th>
          <th scope="col">Version {right.version}</th>
          <th scope="col">Change</th>
        </tr>
      </thead>
      <tbody>
        {rows.map((r) => (
          <tr key={r.stage} className="border-t border-rule">
            <td className="py-1">{step(r.left)}</td>
            <td className="py-1">{step(r.right)}</td>
            <td className="py-1">{r.change}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

export function RoutesPage() {
  const me = useSignedIn();
  const families = useFamilies();
  const kinds = usePartKinds();
  const stages = useProcessStages();
  const [params, setParams] = useSearchParams();
  const family = params.get('family') ?? families.data?.[0]?.code ?? '';
  const versions = useRouteVersions(family);
  const castings = useCastingNumbers(family);
  const retireCasting = useRetireCastingNumber();
  const [drafting, setDrafting] = useState<{ start: RouteVersionJson | null } | null>(null);
  const [approving, setApproving] = useState<RouteVersionJson | null>(null);
  const [comparing, setComparing] = useState<RouteVersionJson | null>(null);
  const [addingCasting, setAddingCasting] = useState(false);
  const canApprove = !!me?.can('process.approve');
  const byKind = new Map<string, RouteVersionJson[]>();
  for (const v of versions.data ?? []) byKind.set(v.partKind, [...(byKind.get(v.partKind) ?? []), v]);
  const compareWith = comparing
    ? ((byKind.get(comparing.partKind) ?? []).find((v) => v.inForce && v.id !== comparing.id) ??
      (byKind.get(comparing.partKind) ?? []).find((v) => v.id !== comparing.id))
    : undefined;

  return (
    <>
      <PageHeader
        title="Routes"
        description="Each family's routes, version by version. A change is a draft until someone other than its author approves it with a signature; parts keep the version they started on."
        actions={
          <Button variant="primary" disabled={!family} onClick={() => setDrafting({ start: null })}>
            Draft a route
          </Button>
        }
      />
      <div className="mb-4 max-w-sm">
        <Field id="route-family" label="Engine family">
          <Select
            id="route-family"
            value={family}
            options={(families.data ?? []).map((f) => ({ value: f.code, label: `${f.code} — ${f.name}` }))}
            onChange={(e) => setParams({ family: e.target.value })}
          />
        </Field>
      </div>
      {versions.error && (
        <Notice tone="bad" live="alert">
          {versions.error.message}
        </Notice>
      )}
      <div className="flex flex-col gap-6" aria-busy={versions.isFetching}>
        {[...byKind.entries()].map(([kind, list]) => (
          <Card key={kind} labelledBy={`route-${kind}`}>
            <CardHeader id={`route-${kind}`} title={kinds.data?.find((k) => k.code === kind)?.name ?? kind} />
            <CardBody>
              <ul className="flex flex-col gap-3">
                {list.map((v) => (
                  <VersionCard
                    key={v.id}
                    v={v}
                    canApprove={canApprove}
                    mine={!!me && v.createdById === me.user.id}
                    onApprove={() => setApproving(v)}
                    onNext={() => setDrafting({ start: v })}
                    onCompare={() => setComparing(v)}
                  />
                ))}
              </ul>
              {comparing?.partKind === kind && compareWith && (
                <div className="mt-4">
                  <Comparison a={compareWith.id} b={comparing.id} />
                </div>
              )}
            </CardBody>
          </Card>
        ))}
        {versions.data?.length === 0 && (
          <p className="text-ink-soft">No routes for {family} yet. Draft the first one.</p>
        )}
        <Card labelledBy="castings-heading">
          <CardHeader
            id="castings-heading"
            title="Casting numbers this family accepts"
            description="Intake asks for a reason on a casting number not listed here."
            actions={<Button onClick={() => setAddingCasting(true)}>Add casting number</Button>}
          />
          <CardBody>
            <ul className="flex flex-col gap-2">
              {(castings.data ?? []).map((c) => (
                <li key={c.id} className="flex flex-wrap items-center gap-2">
                  <span className="font-mono">{c.castingNumber}</span>
                  <span className="text-ink-soft">{c.partKind}</span>
                  {c.retired ? (
                    <Badge tone="off">Retired</Badge>
                  ) : (
                    <Button
                      size="sm"
                      aria-label={`Retire casting number ${c.castingNumber}`}
                      onClick={() => retireCasting.mutate(c.id)}
                    >
                      Retire
                    </Button>
                  )}
                </li>
              ))}
              {castings.data?.length === 0 && <li className="text-ink-soft">None listed: intake accepts any.</li>}
            </ul>
          </CardBody>
        </Card>
      </div>
      {drafting && (
        <DraftRouteDialog
          family={family}
          kinds={kinds.data ?? []}
          stages={stages.data ?? []}
          start={drafting.start}
          onClose={() => setDrafting(null)}
        />
      )}
      {approving && <ApproveRouteDialog route={approving} onClose={() => setApproving(null)} />}
      {addingCasting && (
        <AddCastingNumberDialog family={family} kinds={kinds.data ?? []} onClose={() => setAddingCasting(false)} />
      )}
    </>
  );
}
