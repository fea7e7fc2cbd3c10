import type { QueryClient } from '@tanstack/react-query';
import { useState, type ReactNode } from 'react';
import { data, useParams, type LoaderFunctionArgs } from 'react-router';
import type { RuleHistoryJson } from '../../../shared/schemas/spec';
import { useSignedIn } from '../../api/auth/me';
import { ruleHistoryQueryOptions, useRuleHistory } from '../../api/spec/history';
import { ButtonLink } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Notice } from '../../components/ui/notice';
import { specBookHref } from '../../lib/paths';
import { requirePermission } from '../../lib/session';
import { CriticalMark } from './critical-mark';
import { DemoValuesNotice } from './demo-notice';
import { DraftSection } from './draft-section';
import { formatNumber, KIND_HINTS, KIND_LABELS } from './limits';
import { RuleCard } from './rule-card';
import { VersionHistory } from './version-history';

function ruleParams(params: Record<string, string | undefined>): { family: string; characteristicId: number } {
  const id = Number(params.characteristicId);
  const family = (params.family ?? '').toUpperCase();
  if (!family || !Number.isInteger(id) || id <= 0) throw data(null, { status: 404, statusText: 'No such rule' });
  return { family, characteristicId: id };
}

export const ruleLoader =
  (queryClient: QueryClient) =>
  async ({ request, params }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'spec.read');
    const { family, characteristicId } = ruleParams(params);
    await queryClient.ensureQueryData(ruleHistoryQueryOptions(family, characteristicId));
    return null;
  };

function Facts({ history }: { history: RuleHistoryJson }) {
  const c = history.characteristic;
  const rows: [string, ReactNode][] = [
    ['Where measured', c.positionsLabel],
    ['Kind', `${KIND_LABELS[c.kind]}. ${KIND_HINTS[c.kind]}`],
    ['Unit', c.unit ?? '—'],
    ['Gauge resolution', c.resolution === null ? '—' : `${formatNumber(c.resolution)}${c.unit ? ` ${c.unit}` : ''}`],
    ['Critical', c.critical ? 'Yes: a failure here matters beyond this part.' : 'No'],
  ];
  if (c.help) rows.push(['How it is measured', c.help]);
  return (
    <Card labelledBy="facts-heading">
      <CardHeader id="facts-heading" title="The characteristic" />
      <CardBody>
        <dl className="grid grid-cols-1 gap-x-4 gap-y-2.5 sm:grid-cols-[10rem_minmax(0,1fr)]">
          {rows.map(([k, v]) => (
            <div key={k} className="contents">
              <dt className="text-sm font-medium text-ink-soft">{k}</dt>
              <dd>{v}</dd>
            </div>
          ))}
        </dl>
      </CardBody>
    </Card>
  );
}

export function RulePage() {
  const me = useSignedIn();
  const { family, characteristicId } = ruleParams(useParams());
  const { data: history, error } = useRuleHistory(family, characteristicId);
  // a message belongs to the rule it was said about; another rule's page starts without it
  const [said, setSaid] = useState<{ about: string; text: string } | null>(null);
  const about = `${family}/${characteristicId}`;
  const message = said?.about === about ? said.text : null;
  const setMessage = (text: string) => setSaid({ about, text });
  if (!me || !history) {
    return error ? (
      <Notice tone="bad" live="alert">
        {error.message}
      </Notice>
    ) : null;
  }
  const c = history.characteristic;

  return (
    <>
      <div className="mb-5 flex flex-wrap items-end justify-between gap-4">
        <div className="min-w-0 max-w-3xl">
          <p className="text-ink-soft">
            <span className="font-mono font-semibold text-ink">{history.family.code}</span> {history.family.name} ·
            Stage: {history.stage.name}
          </p>
          <h1 className="flex flex-wrap items-center gap-x-3 gap-y-1 text-[1.75rem] font-semibold leading-tight tracking-tight">
            {c.name}
            {c.critical && <CriticalMark />}
          </h1>
          <p className="mt-1 text-ink-soft">
            The tolerance rule for this characteristic on {history.family.code} engines, and every version of it.
            Readings keep the version they were judged by.
          </p>
        </div>
        <ButtonLink to={specBookHref(history.family.code, history.stage.code)} icon="chevronLeft">
          {history.stage.name} in the spec book
        </ButtonLink>
      </div>
      <div className="mb-5 flex flex-col gap-3">
        {message && (
          <Notice tone="ok" live="status">
            {message}
          </Notice>
        )}
        <DemoValuesNotice />
      </div>
      <div className="grid grid-cols-1 items-start gap-5 xl:grid-cols-[minmax(0,1.35fr)_minmax(0,1fr)]">
        <div className="flex flex-col gap-5">
          <RuleCard history={history} />
          <DraftSection history={history} me={me} onMessage={setMessage} />
        </div>
        <Facts history={history} />
      </div>
      <div className="mt-5">
        <VersionHistory history={history} />
      </div>
    </>
  );
}
