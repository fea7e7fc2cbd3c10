import { useCallback, useMemo } from 'react';
import type uPlot from 'uplot';
import type { WeibullJson } from '../../../../shared/schemas/warranty';
import { CHART_COLOURS, UPlotChart } from './uplot-chart';

const C = CHART_COLOURS;

/** Weibull probability paper: x = ln t, y = ln(−ln(1 − F)), so a Weibull life is a straight line. */
const X = (t: number) => Math.log(t);
const Y = (f: number) => Math.log(-Math.log(1 - f));

const F_TICKS = [0.001, 0.002, 0.005, 0.01, 0.02, 0.05, 0.1, 0.2, 0.3, 0.5, 0.632, 0.8, 0.9, 0.95, 0.99, 0.999];
const T_TICKS = [0.1, 0.2, 0.5, 1, 2, 3, 6, 12, 24, 36, 60, 120, 240, 480, 1000];
const HEIGHT = 380;
const percent = (f: number) => `${+(f * 100).toPrecision(3)} %`;

type Props = { w: WeibullJson };

/**
 * The probability plot of the fleet: each failure at Johnson's adjusted rank through Bernard's
 * approximation (open circles), the median-rank regression line (solid) and the maximum-likelihood
 * line (dashed). The axes are drawn on the transformed scales with ticks in months and per cent.
 */
export function WeibullPlot({ w }: Props) {
  const lines = useMemo(
    () =>
      [
        { fit: w.regression, colour: C.accent, dash: [] as number[] },
        { fit: w.mle, colour: C.hold, dash: [8, 5] },
      ]
        .filter((l) => l.fit)
        .map((l) => ({
          ...l,
          points: l.fit!.line.filter((p) => p.time > 0 && p.fractionFailed > 0 && p.fractionFailed < 0.999),
        })),
    [w],
  );
  const bounds = useMemo(() => {
    const xs = [...w.points.map((p) => X(p.time)), ...lines.flatMap((l) => l.points.map((p) => X(p.time)))];
    const ys = [
      ...w.points.map((p) => Y(p.medianRank)),
      ...lines.flatMap((l) => l.points.map((p) => Y(p.fractionFailed))),
    ];
    const pad = (lo: number, hi: number) => [lo - 0.05 * (hi - lo || 1), hi + 0.05 * (hi - lo || 1)] as const;
    return { x: pad(Math.min(...xs), Math.max(...xs)), y: pad(Math.min(...ys), Math.max(...ys)) };
  }, [w, lines]);
  const data = useMemo<uPlot.AlignedData>(() => [[...bounds.x], [...bounds.y]], [bounds]);

  const build = useCallback(
    (_lib: unknown, width: number): uPlot.Options => {
      const inRange = (v: number, [lo, hi]: readonly [number, number]) => v >= lo && v <= hi;
      // ticks at least this many pixels apart, so their labels never run into each other
      const spaced = (values: number[], [lo, hi]: readonly [number, number], pixels: number, gap: number) => {
        const minimum = ((hi - lo) * gap) / pixels;
        const kept: number[] = [];
        for (const v of values.filter((x) => inRange(x, [lo, hi]))) {
          if (!kept.length || v - kept.at(-1)! >= minimum) kept.push(v);
        }
        return kept;
      };
      return {
        width: 0,
        height: 0,
        legend: { show: false },
        cursor: { show: false },
        scales: { x: { time: false, range: () => [...bounds.x] }, y: { range: () => [...bounds.y] } },
        axes: [
          {
            stroke: C.soft,
            label: 'Months in service (log scale)',
            grid: { stroke: '#e6e1d6' },
            splits: () => spaced(T_TICKS.map(X), bounds.x, Math.max(width - 90, 200), 34),
            values: (_u, s) => s.map((v) => String(+Math.exp(v).toPrecision(2))),
          },
          {
            stroke: C.soft,
            size: 64,
            label: 'Fraction failed (Weibull scale)',
            grid: { stroke: '#e6e1d6' },
            splits: () => spaced(F_TICKS.map(Y), bounds.y, HEIGHT - 70, 18),
            values: (_u, s) => s.map((v) => percent(1 - Math.exp(-Math.exp(v)))),
          },
        ],
        series: [{}, { stroke: 'transparent', points: { show: false } }],
        hooks: {
          draw: [
            (u) => {
              const ctx = u.ctx;
              const px = devicePixelRatio;
              ctx.save();
              ctx.beginPath();
              ctx.rect(u.bbox.left, u.bbox.top, u.bbox.width, u.bbox.height);
              ctx.clip();
              for (const l of lines) {
                ctx.strokeStyle = l.colour;
                ctx.lineWidth = 2 * px;
                ctx.setLineDash(l.dash.map((d) => d * px));
                ctx.beginPath();
                l.points.forEach((p, i) => {
                  const x = u.valToPos(X(p.time), 'x', true);
                  const y = u.valToPos(Y(p.fractionFailed), 'y', true);
                  if (i) ctx.lineTo(x, y);
                  else ctx.moveTo(x, y);
                });
                ctx.stroke();
              }
              ctx.setLineDash([]);
              ctx.strokeStyle = C.ink;
              ctx.fillStyle = '#fffdf8';
              ctx.lineWidth = 1.5 * px;
              for (const p of w.points) {
                const x = u.valToPos(X(p.time), 'x', true);
                const y = u.valToPos(Y(p.medianRank), 'y', true);
                ctx.beginPath();
                ctx.arc(x, y, 4 * px, 0, 2 * Math.PI);
                ctx.fill();
                ctx.stroke();
              }
              ctx.restore();
            },
          ],
        },
      };
    },
    [bounds, lines, w.points],
  );

  return (
    <>
      <UPlotChart
        build={build}
        data={data}
        height={HEIGHT}
        label={`Weibull probability plot: ${w.failures} failures among ${w.units} units in service${w.regression ? `; regression shape ${w.regression.shape.toFixed(2)}, scale ${w.regression.scale.toFixed(1)} months` : ''}${w.mle ? `; maximum likelihood shape ${w.mle.shape.toFixed(2)}, scale ${w.mle.scale.toFixed(1)} months` : ''}.`}
      />
      <ul aria-label="Key" className="mt-2 flex flex-wrap gap-x-5 gap-y-1 text-sm text-ink-soft">
        <li className="flex items-center gap-1.5">
          <span aria-hidden className="inline-block size-3 rounded-full border-2 border-ink bg-card" />A failure, at its
          adjusted median rank
        </li>
        {w.regression && (
          <li className="flex items-center gap-1.5">
            <span aria-hidden className="inline-block h-0.5 w-6 bg-accent" />
            Median-rank regression (solid)
          </li>
        )}
        {w.mle && (
          <li className="flex items-center gap-1.5">
            <span aria-hidden className="inline-block w-6 border-t-2 border-dashed border-hold" />
            Maximum likelihood (dashed)
          </li>
        )}
      </ul>
    </>
  );
}

export { percent };
