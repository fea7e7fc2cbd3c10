import type { QueryClient } from '@tanstack/react-query';
import { useId, useState, type FormEvent } from 'react';
import { useParams, type LoaderFunctionArgs } from 'react-router';
import type { CalibrationBody } from '../../../shared/schemas/gauges';
import { useSignedIn } from '../../api/auth/me';
import { gaugeQueryOptions, useGauge, useRecordCalibration } from '../../api/gauges/gauges';
import { PageHeader } from '../../components/page-header';
import { Badge } from '../../components/ui/badge';
import { Button, ButtonLink } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Input } from '../../components/ui/input';
import { Notice } from '../../components/ui/notice';
import { Table, TableFrame, TBody, TD, TH, THead, TR } from '../../components/ui/table';
import { ApiError } from '../../lib/http';
import { blastHref, gaugeStudiesHref } from '../../lib/paths';
import { requirePermission } from '../../lib/session';
import { GaugeStateBadge } from './gauge-state-badge';

const canonical = (raw: string | undefined) => (raw ?? '').trim().toUpperCase();

export const gaugeLoader =
  (queryClient: QueryClient) =>
  async ({ request, params }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'gauges.read');
    await queryClient.ensureQueryData(gaugeQueryOptions(canonical(params.code)));
    return null;
  };

type Point = { reference: string; asFound: string; asLeft: string; tolerance: string };

function Labelled({ label, children }: { label: string; children: (id: string) => React.ReactNode }) {
  const id = useId();
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="text-sm font-semibold">
        {label}
      </label>
      {children(id)}
    </div>
  );
}

/** As found and as left at each check point; out of tolerance as found takes the gauge out of use. */
function CalibrationForm({
  code,
  today,
  unit,
  tolerance,
}: {
  code: string;
  today: string;
  unit: string;
  tolerance: number;
}) {
  const record = useRecordCalibration(code);
  const [on, setOn] = useState(today);
  const [by, setBy] = useState<'in_house' | 'lab'>('in_house');
  const [performer, setPerformer] = useState('');
  const [certificate, setCertificate] = useState('');
  const [points, setPoints] = useState<Point[]>([
    { reference: '', asFound: '', asLeft: '', tolerance: String(tolerance) },
  ]);
  const [problem, setProblem] = useState<string | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const setPoint = (i: number, k: keyof Point, v: string) =>
    setPoints((ps) => ps.map((p, j) => (j === i ? { ...p, [k]: v } : p)));
  const submit = async (e: FormEvent) => {
    e.preventDefault();
    setProblem(null);
    setDone(null);
    const body: CalibrationBody = {
      calibratedOn: on,
      performedBy: by,
      performer,
      certificate,
      certificateAttachmentId: null,
      notes: '',
      points: points.map((p) => ({
        reference: Number(p.reference),
        asFound: Number(p.asFound),
        asLeft: Number(p.asLeft),
        tolerance: Number(p.tolerance),
      })),
    };
    try {
      const c = await record.mutateAsync(body);
      setDone(
        c.asFoundInTolerance
          ? `Recorded: in tolerance as found; due ${c.dueOn}.`
          : `Recorded: OUT OF TOLERANCE as found (off by up to ${c.asFoundError} ${unit}). The gauge is out of use until quality has assessed what it measured.`,
      );
    } catch (err) {
      setProblem(
        err instanceof ApiError ? [err.message, ...Object.values(err.fields)].join(' ') : 'Could not record it.',
      );
    }
  };
  return (
    <form onSubmit={submit} className="flex flex-col gap-4" aria-label="Record a calibration">
      <div className="grid grid-cols-1 gap-3 sm:grid-cols-2 lg:grid-cols-4">
        <Labelled label="Calibrated on">
          {(id) => <Input id={id} type="date" value={on} onChange={(e) => setOn(e.target.value)} mono />}
        </Labelled>
        <Labelled label="Calibrated by">
          {(id) => (
            <select
              id={id}
              className="h-9 rounded-control border border-rule-strong bg-card px-2"
              value={by}
              onChange={(e) => setBy(e.target.value as 'in_house' | 'lab')}
            >
              <option value="in_house">In house</option>
              <option value="lab">A calibration laboratory</option>
            </select>
          )}
        </Labelled>
        <Labelled label="Technician or laboratory">
          {(id) => <Input id={id} value={performer} onChange={(e) => setPerformer(e.target.value)} />}
        </Labelled>
        <Labelled label="Certificate number">
          {(id) => <Input id={id} value={certificate} onChange={(e) => setCertificate(e.target.value)} mono />}
        </Labelled>
      </div>
      <fieldset className="flex flex-col gap-2">
        <legend className="text-sm font-semibold">Check points ({unit})</legend>
        {points.map((p, i) => (
          <div key={i} className="grid grid-cols-2 gap-3 sm:grid-cols-4">
            {(
              [
                ['reference', 'Reference'],
                ['asFound', 'As found'],
                ['asLeft', 'As left'],
                ['tolerance', 'Permitted error ±'],
              ] as [keyof Point, string][]
            ).map(([k, label]) => (
              <Labelled key={k} label={`${label} (point ${i + 1})`}>
                {(id) => (
                  <Input
                    id={id}
                    inputMode="decimal"
                    mono
                    value={p[k]}
                    onChange={(e) => setPoint(i, k, e.target.value)}
                  />
                )}
              </Labelled>
            ))}
          </div>
        ))}
        {points.length < 5 && (
          <div>
            <Button
              size="sm"
              icon="plus"
              onClick={() =>
                setPoints((ps) => [...ps, { reference: '', asFound: '', asLeft: '', tolerance: String(tolerance) }])
              }
            >
              Add a check point
            </Button>
          </div>
        )}
      </fieldset>
      {problem && (
        <Notice tone="bad" title="Not recorded" live="alert">
          {problem}
        </Notice>
      )}
      {done && (
        <Notice tone="info" title="Calibration recorded" live="status">
          {done}
        </Notice>
      )}
      <div className="flex justify-end">
        <Button type="submit" variant="primary" disabled={record.isPending}>
          Record the calibration
        </Button>
      </div>
    </form>
  );
}

export function GaugePage() {
  const me = useSignedIn();
  const { data } = useGauge(canonical(useParams().code));
  if (!me || !data) return null;
  const g = data.gauge;
  const facts: [string, string][] = [
    ['Kind', g.kind],
    ['Serial', g.serial || '—'],
    ['Range', g.rangeLow === null ? '—' : `${g.rangeLow}–${g.rangeHigh} ${g.unit ?? ''}`],
    ['Resolution', g.resolution === null ? '—' : `${g.resolution} ${g.unit ?? ''}`],
    ['Location', g.location || '—'],
    ['Owner', g.owner || '—'],
    ['Interval', g.intervalDays ? `${g.intervalDays} days` : '—'],
    ['Due', g.calibrationDueOn ? `${g.calibrationDueOn} (${g.daysLeft} days)` : '—'],
  ];
  return (
    <div className="mx-auto max-w-page">
      <PageHeader
        title={
          <span className="flex flex-wrap items-center gap-3">
            <span className="font-mono">{g.code}</span>
            <GaugeStateBadge gauge={g} />
            {g.studyVerdict === 'unacceptable' && <Badge tone="bad">Last study failed</Badge>}
          </span>
        }
        description={g.description}
        actions={
          <>
            <ButtonLink to={gaugeStudiesHref(g.code)} icon="chain">
              Gauge studies
            </ButtonLink>
            {me.can('containment.read') && (
              <ButtonLink to={blastHref({ gauge: g.code })} icon="arrowRight">
                What did it measure?
              </ButtonLink>
            )}
          </>
        }
      />
      <div className="flex flex-col gap-5">
        <Card labelledBy="gauge-facts">
          <CardHeader id="gauge-facts" title="The gauge" />
          <CardBody>
            <dl className="grid grid-cols-2 gap-x-6 gap-y-2 lg:grid-cols-4">
              {facts.map(([k, v]) => (
                <div key={k}>
                  <dt className="text-xs font-semibold uppercase tracking-wide text-ink-soft">{k}</dt>
                  <dd className="font-mono">{v}</dd>
                </div>
              ))}
            </dl>
          </CardBody>
        </Card>
        {me.can('gauges.manage') && g.status !== 'retired' && (
          <Card labelledBy="cal-form">
            <CardHeader
              id="cal-form"
              title="Record a calibration"
              description="Enter each check point as found, before any adjustment, and as left. A gauge found out of tolerance puts what it measured since its last good calibration in doubt."
            />
            <CardBody>
              <CalibrationForm
                code={g.code}
                today={data.today}
                unit={g.unit ?? ''}
                tolerance={g.resolution ?? 0.0001}
              />
            </CardBody>
          </Card>
        )}
        <TableFrame label="Calibration records">
          <Table caption={`${data.calibrations.length} calibration record(s), newest first`}>
            <THead>
              <TR>
                <TH>On</TH>
                <TH>As found</TH>
                <TH>As left</TH>
                <TH align="right">Largest error</TH>
                <TH>By</TH>
                <TH>Certificate</TH>
                <TH>Due</TH>
              </TR>
            </THead>
            <TBody>
              {data.calibrations.map((c) => (
                <TR key={c.id}>
                  <TD mono nowrap>
                    {c.calibratedOn}
                  </TD>
                  <TD>
                    {c.asFoundInTolerance ? (
                      <Badge tone="ok">In tolerance</Badge>
                    ) : (
                      <Badge tone="bad">Out of tolerance</Badge>
                    )}
                  </TD>
                  <TD>
                    {c.asLeftInTolerance ? (
                      <Badge tone="ok">In tolerance</Badge>
                    ) : (
                      <Badge tone="bad">Out of tolerance</Badge>
                    )}
                  </TD>
                  <TD mono align="right">
                    {c.asFoundError}
                  </TD>
                  <TD>
                    {c.performer} ({c.performedBy === 'lab' ? 'laboratory' : 'in house'})
                  </TD>
                  <TD mono>
                    {c.certificateUrl ? (
                      <a href={c.certificateUrl}>{c.certificate ?? 'PDF'}</a>
                    ) : (
                      (c.certificate ?? '—')
                    )}
                  </TD>
                  <TD mono nowrap>
                    {c.dueOn}
                  </TD>
                </TR>
              ))}
            </TBody>
          </Table>
        </TableFrame>
      </div>
    </div>
  );
}
