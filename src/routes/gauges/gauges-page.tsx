import type { QueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { Link, type LoaderFunctionArgs } from 'react-router';
import { useSignedIn } from '../../api/auth/me';
import { gaugesQueryOptions, useGauges } from '../../api/gauges/gauges';
import { PageHeader } from '../../components/page-header';
import { Badge } from '../../components/ui/badge';
import { Button } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Table, TableFrame, TBody, TD, TH, THead, TR } from '../../components/ui/table';
import { gaugeHref } from '../../lib/paths';
import { requirePermission } from '../../lib/session';
import { AddGaugeDialog } from './add-gauge-dialog';
import { GaugeStateBadge } from './gauge-state-badge';

export const gaugesLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'gauges.read');
    await queryClient.ensureQueryData(gaugesQueryOptions());
    return null;
  };

const range = (lo: number | null, hi: number | null, unit: string | null) =>
  lo === null || hi === null ? '—' : `${lo}–${hi} ${unit ?? ''}`;

/** The register, the gauges needing attention first: overdue, never calibrated, due soonest. */
export function GaugesPage() {
  const { data } = useGauges();
  const me = useSignedIn();
  const [adding, setAdding] = useState(false);
  if (!data) return null;
  const due = data.rows.filter((g) => g.state === 'due' || g.state === 'overdue' || g.state === 'never_calibrated');
  return (
    <div className="mx-auto max-w-page">
      <PageHeader
        title="Gauges"
        description={`The gauge register. Days left count in the plant’s calendar: today is ${data.today}.`}
        actions={
          me?.can('gauges.manage') && (
            <Button variant="primary" onClick={() => setAdding(true)}>
              Add gauge
            </Button>
          )
        }
      />
      {adding && <AddGaugeDialog onClose={() => setAdding(false)} />}
      <div className="flex flex-col gap-5">
        <Card labelledBy="due-heading">
          <CardHeader
            id="due-heading"
            title="Needs calibration"
            description={`${due.length} gauge(s) due within 30 days, overdue or never calibrated.`}
          />
          <CardBody>
            {due.length ? (
              <ul className="flex flex-wrap gap-3">
                {due.map((g) => (
                  <li key={g.code} className="flex items-center gap-2">
                    <Link to={gaugeHref(g.code)} className="font-mono text-accent underline">
                      {g.code}
                    </Link>
                    <GaugeStateBadge gauge={g} />
                    <span className="font-mono text-sm">{g.daysLeft === null ? '' : `${g.daysLeft} d`}</span>
                  </li>
                ))}
              </ul>
            ) : (
              <p>Nothing is due in the next 30 days.</p>
            )}
          </CardBody>
        </Card>
        <TableFrame label="Gauge register">
          <Table caption={`${data.rows.length} gauges`}>
            <THead>
              <TR>
                <TH>Gauge</TH>
                <TH>Description</TH>
                <TH>Range</TH>
                <TH align="right">Resolution</TH>
                <TH wideOnly>Location</TH>
                <TH>State</TH>
                <TH>Due</TH>
                <TH align="right">Days left</TH>
              </TR>
            </THead>
            <TBody>
              {data.rows.map((g) => (
                <TR key={g.code} muted={g.status === 'retired'}>
                  <TD mono nowrap>
                    <Link to={gaugeHref(g.code)} className="text-accent underline">
                      {g.code}
                    </Link>
                  </TD>
                  <TD>
                    {g.description}
                    {g.studyVerdict === 'unacceptable' && (
                      <span className="ml-2">
                        <Badge tone="bad">Last study failed</Badge>
                      </span>
                    )}
                  </TD>
                  <TD mono nowrap>
                    {range(g.rangeLow, g.rangeHigh, g.unit)}
                  </TD>
                  <TD mono align="right">
                    {g.resolution ?? '—'}
                  </TD>
                  <TD wideOnly>{g.location}</TD>
                  <TD>
                    <GaugeStateBadge gauge={g} />
                  </TD>
                  <TD mono nowrap>
                    {g.calibrationDueOn ?? '—'}
                  </TD>
                  <TD mono align="right">
                    {g.daysLeft ?? '—'}
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
