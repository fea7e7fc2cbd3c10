import type { QueryClient } from '@tanstack/react-query';
import { useId, useMemo, useState, type FormEvent } from 'react';
import { useParams, useSearchParams, type LoaderFunctionArgs } from 'react-router';
import type { AttributeStudyResult } from '../../../shared/domain/attribute-study';
import { anovaGaugeStudy, type AnovaResult } from '../../../shared/domain/gauge-rr-anova';
import { averageAndRange, type AverageRangeResult } from '../../../shared/domain/gauge-rr-range';
import { StudyDataError } from '../../../shared/domain/study-error';
import type { StudyJson } from '../../../shared/schemas/gauges';
import { useSignedIn } from '../../api/auth/me';
import { gaugeQueryOptions, useGauge } from '../../api/gauges/gauges';
import { studiesQueryOptions, useApproveStudy, useStudies } from '../../api/gauges/studies';
import { PageHeader } from '../../components/page-header';
import { SigningStatement } from '../../components/signing-statement';
import { Badge } from '../../components/ui/badge';
import { Button, ButtonLink } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Input, Textarea } from '../../components/ui/input';
import { Notice } from '../../components/ui/notice';
import { EmptyRow, Table, TableFrame, TBody, TD, TH, THead, TR } from '../../components/ui/table';
import { ApiError } from '../../lib/http';
import { gaugeHref } from '../../lib/paths';
import { requirePermission } from '../../lib/session';
import { StudyEntry } from './study-entry';
import { AnovaTable, AttributeFigures, BandBadge, BandsLegend, GrrTable, RangeDetails } from './study-figures';

const canonical = (raw: string | undefined) => (raw ?? '').trim().toUpperCase();

export const studiesLoader =
  (queryClient: QueryClient) =>
  async ({ request, params }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'gauges.read');
    const code = canonical(params.code);
    await Promise.all([
      queryClient.ensureQueryData(gaugeQueryOptions(code)),
      queryClient.ensureQueryData(studiesQueryOptions(code)),
    ]);
    return null;
  };

export const METHOD_LABELS: Record<StudyJson['method'], string> = {
  range: 'Gauge R&R, average and range',
  anova: 'Gauge R&R, ANOVA',
  attribute: 'Attribute agreement',
};

const when = (iso: string) => iso.slice(0, 16).replace('T', ' ');

function ApproveForm({ study, signer }: { study: StudyJson; signer: string }) {
  const approve = useApproveStudy(study.gauge);
  const reasonId = useId();
  const passwordId = useId();
  const [reason, setReason] = useState('');
  const [password, setPassword] = useState('');
  const [problem, setProblem] = useState<string | null>(null);
  const submit = async (e: FormEvent) => {
    e.preventDefault();
    setProblem(null);
    try {
      await approve.mutateAsync({ id: study.id, reason, password });
      setPassword('');
    } catch (err) {
      setProblem(err instanceof ApiError ? [err.message, ...Object.values(err.fields)].join(' ') : 'Not approved.');
    }
  };
  return (
    <form onSubmit={submit} className="flex flex-col gap-3" aria-label="Approve the study">
      <SigningStatement
        signer={signer}
        meaning="approve this study and its figures as a record"
        subject={`study ${study.id}`}
      />
      <div className="grid grid-cols-1 gap-3 md:grid-cols-2">
        <div className="flex flex-col gap-1">
          <label htmlFor={reasonId} className="text-sm font-semibold">
            Reason
          </label>
          <Textarea id={reasonId} value={reason} onChange={(e) => setReason(e.target.value)} />
        </div>
        <div className="flex flex-col gap-1">
          <label htmlFor={passwordId} className="text-sm font-semibold">
            Password (your signature)
          </label>
          <Input
            id={passwordId}
            type="password"
            autoComplete="current-password"
            value={password}
            onChange={(e) => setPassword(e.target.value)}
          />
        </div>
      </div>
      {problem && (
        <Notice tone="bad" title="Not approved" live="alert">
          {problem}
        </Notice>
      )}
      <div className="flex justify-end">
        <Button type="submit" variant="primary" icon="key" disabled={approve.isPending}>
          Sign and approve
        </Button>
      </div>
    </form>
  );
}

/** The other variable method on the same readings, worked out here for comparison (not the record). */
function useOtherMethod(s: StudyJson) {
  return useMemo(() => {
    if (s.method === 'attribute' || !('readings' in s.data)) return null;
    try {
      const options = { tolerance: s.tolerance };
      return s.method === 'range'
        ? ({ kind: 'anova', r: anovaGaugeStudy(s.data.readings, options) } as const)
        : ({ kind: 'range', r: averageAndRange(s.data.readings, options) } as const);
    } catch (err) {
      if (err instanceof StudyDataError) return { kind: 'none', problem: err.message } as const;
      throw err;
    }
  }, [s]);
}

function StudyDetail({ study, canApprove, signer }: { study: StudyJson; canApprove: boolean; signer: string }) {
  const other = useOtherMethod(study);
  return (
    <Card labelledBy="study-detail">
      <CardHeader
        id="study-detail"
        title={`Study ${study.id}: ${METHOD_LABELS[study.method]}`}
        description={`${study.characteristic}; recorded ${when(study.recordedAt)} by ${study.recordedBy || '—'}.`}
        actions={<BandBadge band={study.verdict} />}
      />
      <CardBody>
        <div className="flex flex-col gap-5">
          {study.method === 'attribute' ? (
            <AttributeFigures r={study.result as AttributeStudyResult} />
          ) : (
            <>
              <BandsLegend />
              <div className="grid grid-cols-1 gap-5 xl:grid-cols-2">
                <div className="flex flex-col gap-3">
                  {study.method === 'range' ? (
                    <>
                      <GrrTable
                        r={study.result as AverageRangeResult}
                        title="By average and range (on record)"
                        label="Average and range figures"
                      />
                      <RangeDetails r={study.result as AverageRangeResult} />
                    </>
                  ) : (
                    <>
                      <GrrTable r={study.result as AnovaResult} title="By ANOVA (on record)" label="ANOVA figures" />
                      <AnovaTable r={study.result as AnovaResult} />
                    </>
                  )}
                </div>
                <div className="flex flex-col gap-3">
                  {other?.kind === 'anova' && (
                    <GrrTable r={other.r} title="By ANOVA, for comparison" label="ANOVA figures for comparison" />
                  )}
                  {other?.kind === 'range' && (
                    <GrrTable
                      r={other.r}
                      title="By average and range, for comparison"
                      label="Average and range figures for comparison"
                    />
                  )}
                  {other?.kind === 'none' && (
                    <Notice tone="info" title="The other method cannot take this grid">
                      {other.problem}.
                    </Notice>
                  )}
                </div>
              </div>
            </>
          )}
          {study.approval ? (
            <Notice tone="ok" title="Approved">
              Signed by {study.approval.printedName} on {when(study.approval.signedAt)} UTC — {study.approval.meaning}.
              Reason: {study.approval.reason}
            </Notice>
          ) : canApprove ? (
            <ApproveForm study={study} signer={signer} />
          ) : (
            <p className="text-sm text-ink-soft">Not approved yet.</p>
          )}
        </div>
      </CardBody>
    </Card>
  );
}

export function StudiesPage() {
  const me = useSignedIn();
  const code = canonical(useParams().code);
  const { data: gauge } = useGauge(code);
  const { data: studies } = useStudies(code);
  const [params, setParams] = useSearchParams();
  if (!me || !gauge || !studies) return null;
  const g = gauge.gauge;
  const chosen = Number(params.get('study'));
  const selected = studies.find((s) => s.id === chosen) ?? null;
  const show = (id: number) => setParams({ study: String(id) });
  return (
    <div className="mx-auto max-w-page">
      <PageHeader
        title={
          <span className="flex flex-wrap items-center gap-3">
            Gauge studies <span className="font-mono">{g.code}</span>
            {g.studyVerdict === 'unacceptable' && <Badge tone="bad">Last study failed</Badge>}
          </span>
        }
        description={`${g.description}. Gauge R&R by average and range and by ANOVA, and attribute agreement for pass/fail checks.`}
        actions={
          <ButtonLink to={gaugeHref(g.code)} icon="chevronLeft">
            Back to the gauge
          </ButtonLink>
        }
      />
      <div className="flex flex-col gap-5">
        <TableFrame label="Studies on record">
          <Table caption={`${studies.length} stud${studies.length === 1 ? 'y' : 'ies'} of ${g.code}, newest first`}>
            <THead>
              <TR>
                <TH>Recorded</TH>
                <TH>Kind</TH>
                <TH>What was measured</TH>
                <TH>Verdict</TH>
                <TH>Approval</TH>
                <TH>
                  <span className="sr-only">Open</span>
                </TH>
              </TR>
            </THead>
            <TBody>
              {studies.length === 0 && <EmptyRow colSpan={6}>No study of this gauge yet.</EmptyRow>}
              {studies.map((s) => (
                <TR key={s.id}>
                  <TD mono nowrap>
                    {when(s.recordedAt)}
                  </TD>
                  <TD>{METHOD_LABELS[s.method]}</TD>
                  <TD>{s.characteristic}</TD>
                  <TD>
                    <BandBadge band={s.verdict} />
                  </TD>
                  <TD>{s.approval ? <Badge tone="ok">Approved</Badge> : <Badge tone="wait">Not approved</Badge>}</TD>
                  <TD align="right">
                    <Button size="sm" onClick={() => show(s.id)} aria-label={`Show study ${s.id}`}>
                      Show
                    </Button>
                  </TD>
                </TR>
              ))}
            </TBody>
          </Table>
        </TableFrame>
        {selected && <StudyDetail study={selected} canApprove={me.can('gauges.manage')} signer={me.user.name} />}
        {me.can('gauges.manage') && (
          <Card labelledBy="new-study">
            <CardHeader
              id="new-study"
              title="Enter a study"
              description="Each appraiser measures each part, blind and in random order, on each trial. The figures appear as soon as the grid is full."
            />
            <CardBody>
              <StudyEntry code={g.code} unit={g.unit ?? ''} onRecorded={(s) => show(s.id)} />
            </CardBody>
          </Card>
        )}
      </div>
    </div>
  );
}
