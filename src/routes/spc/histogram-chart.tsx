import { useMemo } from 'react';
import type uPlot from 'uplot';
import { normalPdf } from '../../../shared/domain/spc/normal';
import type { Histogram } from '../../../shared/domain/spc/histogram';
import { ACCENT, BAD, BAD_TINT, INK, INK_SOFT, Plot } from './plot';
import { fixed } from './numbers';

type Props = {
  histogram: Histogram;
  /** The specification limits themselves (the bins' outer edges lie half a resolution step beyond them). */
  limits: { lower: number | null; upper: number | null } | null;
  digits: number;
  unit: string | null;
  mean: number | null;
  sigma: number | null;
};

/**
 * Readings per bin against the specification limits: bins inside the tolerance in the action
 * colour; bins outside it red with diagonal hatching and the word "outside" in the table; the
 * limits as heavy lines with their names; the normal curve of the overall mean and σ for comparison.
 */
export function HistogramChart({ histogram, limits, digits, unit, mean, sigma }: Props) {
  const { bins } = histogram;
  const lowerLimit = limits?.lower ?? null;
  const upperLimit = limits?.upper ?? null;
  const data = useMemo<uPlot.AlignedData>(
    () => [bins.map((b) => (b.lower + b.upper) / 2), bins.map((b) => b.count)],
    [bins],
  );
  const options = useMemo<Omit<uPlot.Options, 'width' | 'height'>>(() => {
    const spec = { lower: lowerLimit, upper: upperLimit };
    const lo = Math.min(bins[0]!.lower, spec.lower ?? Infinity);
    const hi = Math.max(bins.at(-1)!.upper, spec.upper ?? -Infinity);
    const pad = (hi - lo) * 0.04;
    const top = Math.max(...bins.map((b) => b.count), 1);
    return {
      legend: { show: false },
      cursor: { show: false },
      scales: { x: { time: false, range: () => [lo - pad, hi + pad] }, y: { range: () => [0, top * 1.15] } },
      axes: [
        { stroke: INK_SOFT, grid: { show: false }, values: (_u, s) => s.map((v) => fixed(v, digits)) },
        { stroke: INK_SOFT, size: 56, grid: { stroke: '#e6e1d6' } },
      ],
      series: [{}, { stroke: 'transparent', points: { show: false } }],
      hooks: {
        draw: [
          (u) => {
            const ctx = u.ctx;
            const px = devicePixelRatio;
            ctx.save();
            const y0 = u.valToPos(0, 'y', true);
            for (const b of bins) {
              if (!b.count) continue;
              const x0 = u.valToPos(b.lower, 'x', true) + px;
              const x1 = u.valToPos(b.upper, 'x', true) - px;
              const y = u.valToPos(b.count, 'y', true);
              const outside = b.zone !== 'within';
              ctx.fillStyle = outside ? BAD_TINT : ACCENT;
              ctx.fillRect(x0, y, x1 - x0, y0 - y);
              if (outside) {
                ctx.strokeStyle = BAD;
                ctx.lineWidth = 1.5 * px;
                ctx.strokeRect(x0, y, x1 - x0, y0 - y);
                ctx.save();
                ctx.beginPath();
                ctx.rect(x0, y, x1 - x0, y0 - y);
                ctx.clip();
                for (let d = -(y0 - y); d < x1 - x0; d += 6 * px) {
                  ctx.moveTo(x0 + d, y0);
                  ctx.lineTo(x0 + d + (y0 - y), y);
                }
                ctx.stroke();
                ctx.restore();
              }
            }
            if (mean !== null && sigma && sigma > 0) {
              const width = histogram.width;
              const n = histogram.n;
              ctx.strokeStyle = INK;
              ctx.lineWidth = 1.25 * px;
              ctx.setLineDash([5 * px, 3 * px]);
              ctx.beginPath();
              for (let i = 0; i <= 120; i++) {
                const x = lo + ((hi - lo) * i) / 120;
                const yv = (n * width * normalPdf((x - mean) / sigma)) / sigma;
                const X = u.valToPos(x, 'x', true);
                const Y = u.valToPos(yv, 'y', true);
                if (i === 0) ctx.moveTo(X, Y);
                else ctx.lineTo(X, Y);
              }
              ctx.stroke();
              ctx.setLineDash([]);
            }
            ctx.font = `600 ${11 * px}px "IBM Plex Sans", sans-serif`;
            ctx.textBaseline = 'top';
            for (const [v, name] of [
              [spec.lower, 'Lower limit'],
              [spec.upper, 'Upper limit'],
            ] as const) {
              if (v === null) continue;
              const x = Math.round(u.valToPos(v, 'x', true));
              ctx.strokeStyle = BAD;
              ctx.lineWidth = 2.5 * px;
              ctx.beginPath();
              ctx.moveTo(x, u.bbox.top);
              ctx.lineTo(x, u.bbox.top + u.bbox.height);
              ctx.stroke();
              ctx.fillStyle = BAD;
              ctx.textAlign = name === 'Lower limit' ? 'left' : 'right';
              ctx.fillText(
                `${name} ${fixed(v, digits)}`,
                x + (name === 'Lower limit' ? 4 : -4) * px,
                u.bbox.top + 2 * px,
              );
            }
            ctx.restore();
          },
        ],
      },
    };
  }, [bins, lowerLimit, upperLimit, digits, mean, sigma, histogram.width, histogram.n]);

  const outside = bins.filter((b) => b.zone !== 'within').reduce((s, b) => s + b.count, 0);
  return (
    <Plot
      options={options}
      data={data}
      height={210}
      label={`Histogram of ${histogram.n} readings in ${bins.length} bins${unit ? ` (${unit})` : ''}; ${outside} outside the tolerance. The counts are in the table below.`}
    />
  );
}
