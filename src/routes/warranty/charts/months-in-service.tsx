import { useCallback, useMemo } from 'react';
import type uPlot from 'uplot';
import type { MonthInService } from '../../../../shared/schemas/warranty';
import { ChartCard } from './chart-card';
import { CHART_COLOURS, UPlotChart } from './uplot-chart';

const C = CHART_COLOURS;

/**
 * Claims by the month in service they failed in: failures as solid bars, the other claims (not torn
 * down yet, no trouble found, installation) stacked on them as outlined, hatched bars. The units
 * still at risk in each month are in the numbers beside it, with the failure rate among them.
 */
export function MonthsInServiceChart({ rows }: { rows: MonthInService[] }) {
  const data = useMemo<uPlot.AlignedData>(() => [rows.map((r) => r.month), rows.map((r) => r.claims)], [rows]);
  const build = useCallback((): uPlot.Options => {
    const top = Math.max(1, ...rows.map((r) => r.claims));
    const last = Math.max(1, rows.length - 1);
    return {
      width: 0,
      height: 0,
      legend: { show: false },
      cursor: { show: false },
      scales: { x: { time: false, range: () => [-0.6, last + 0.6] }, y: { range: () => [0, Math.ceil(top * 1.15)] } },
      axes: [
        {
          stroke: C.soft,
          grid: { show: false },
          label: 'Month in service (0 = the first month after shipping)',
          incrs: [1, 2, 3, 6, 12],
          values: (_u, s) => s.map((v) => (Number.isInteger(v) ? String(v) : '')),
        },
        {
          stroke: C.soft,
          size: 48,
          label: 'Claims',
          grid: { stroke: '#e6e1d6' },
          incrs: [1, 2, 5, 10, 20, 50],
          values: (_u, s) => s.map((v) => (Number.isInteger(v) ? String(v) : '')),
        },
      ],
      series: [{}, { stroke: 'transparent', points: { show: false } }],
      hooks: {
        draw: [
          (u) => {
            const ctx = u.ctx;
            const px = devicePixelRatio;
            ctx.save();
            const y0 = u.valToPos(0, 'y', true);
            for (const r of rows) {
              if (!r.claims) continue;
              const x0 = u.valToPos(r.month - 0.38, 'x', true);
              const x1 = u.valToPos(r.month + 0.38, 'x', true);
              const yf = u.valToPos(r.failures, 'y', true);
              const yc = u.valToPos(r.claims, 'y', true);
              if (r.failures) {
                ctx.fillStyle = C.accent;
                ctx.fillRect(x0, yf, x1 - x0, y0 - yf);
              }
              if (r.claims > r.failures) {
                ctx.strokeStyle = C.accent;
                ctx.lineWidth = 1.5 * px;
                ctx.strokeRect(x0, yc, x1 - x0, yf - yc);
                ctx.save();
                ctx.beginPath();
                ctx.rect(x0, yc, x1 - x0, yf - yc);
                ctx.clip();
                ctx.lineWidth = px;
                ctx.beginPath();
                for (let d = -(yf - yc); d < x1 - x0; d += 6 * px) {
                  ctx.moveTo(x0 + d, yf);
                  ctx.lineTo(x0 + d + (yf - yc), yc);
                }
                ctx.stroke();
                ctx.restore();
              }
            }
            ctx.restore();
          },
        ],
      },
    };
  }, [rows]);
  const claims = rows.reduce((s, r) => s + r.claims, 0);
  return (
    <ChartCard
      title="Months in service at failure"
      description="When in their life the claimed units failed, counted from the ship date."
      filename="months-in-service.csv"
      rows={rows}
      columns={[
        { header: 'Month in service', value: (r) => r.month, align: 'right' },
        { header: 'Units at risk', value: (r) => r.atRisk, align: 'right' },
        { header: 'Claims', value: (r) => r.claims, align: 'right' },
        { header: 'Failures', value: (r) => r.failures, align: 'right' },
        {
          header: 'Failures per 100 at risk',
          value: (r) => (r.atRisk ? ((100 * r.failures) / r.atRisk).toFixed(2) : null),
          align: 'right',
        },
      ]}
      chart={
        claims === 0 ? (
          <p className="text-ink-soft">No claims in this range yet.</p>
        ) : (
          <>
            <UPlotChart
              build={build}
              data={data}
              height={260}
              label={`Claims by month in service: ${rows
                .filter((r) => r.claims)
                .map((r) => `month ${r.month}, ${r.claims} (${r.failures} failures)`)
                .join('; ')}`}
            />
            <ul aria-label="Key" className="mt-2 flex flex-wrap gap-x-5 gap-y-1 text-sm text-ink-soft">
              <li className="flex items-center gap-1.5">
                <span aria-hidden className="inline-block size-3.5 bg-accent" />
                Failures (the teardown named a failure cause)
              </li>
              <li className="flex items-center gap-1.5">
                <span
                  aria-hidden
                  className="inline-block size-3.5 border-2 border-accent bg-[repeating-linear-gradient(45deg,transparent_0_3px,#0f5362_3px_4px)]"
                />
                Other claims (not torn down yet, no trouble found, installation)
              </li>
            </ul>
          </>
        )
      }
    />
  );
}
