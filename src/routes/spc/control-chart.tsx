import { useMemo, useState } from 'react';
import type uPlot from 'uplot';
import type { ChartLineJson, ChartPointJson, SignalJson } from '../../../shared/schemas/spc';
import { formatWhen } from '../../lib/format';
import { ACCENT, BAD, hLine, INK, INK_SOFT, Plot, RULE, WAIT_TINT } from './plot';
import { fixed } from './numbers';

type Props = {
  line: ChartLineJson;
  points: ChartPointJson[];
  signals: SignalJson[];
  baseline: { from: number; to: number } | null;
  digits: number;
  unit: string | null;
};

/**
 * One control chart: the points joined in time order, the centre line and control limits, the
 * ±1σ and ±2σ zones the run rules use (location charts), the baseline shaded, and every signal
 * marked as a red diamond with its rule's number above it.
 */
export function ControlChart({ line, points, signals, baseline, digits, unit }: Props) {
  const [at, setAt] = useState<number | null>(null);
  const zoned = line.rules.length > 1;
  const flagged = useMemo(() => {
    const m = new Map<number, number[]>();
    for (const s of signals) m.set(s.index, [...(m.get(s.index) ?? []), s.rule]);
    return m;
  }, [signals]);

  const data = useMemo<uPlot.AlignedData>(() => [line.values.map((_, i) => i), line.values], [line.values]);
  const options = useMemo<Omit<uPlot.Options, 'width' | 'height'>>(() => {
    const values = line.values.filter((v): v is number => v !== null);
    const lo = Math.min(line.lower, ...values);
    const hi = Math.max(line.upper, ...values);
    const pad = (hi - lo || Math.abs(hi) || 1) * 0.14;
    return {
      legend: { show: false },
      cursor: { y: false, points: { size: 9 } },
      scales: { x: { time: false }, y: { range: () => [lo - pad, hi + pad] } },
      axes: [
        {
          stroke: INK_SOFT,
          grid: { show: false },
          values: (_u, splits) =>
            splits.map((s) => (Number.isInteger(s) && points[s] ? formatWhen(points[s].at).slice(5, 10) : '')),
        },
        {
          stroke: INK_SOFT,
          size: 70,
          grid: { stroke: '#e6e1d6' },
          values: (_u, splits) => splits.map((s) => fixed(s, digits)),
        },
      ],
      series: [
        {},
        {
          label: line.label,
          stroke: ACCENT,
          width: 1.25,
          spanGaps: true,
          points: { show: values.length <= 400, size: 4, fill: ACCENT, stroke: ACCENT },
        },
      ],
      hooks: {
        drawClear: [
          (u) => {
            // shaded only when the limits come from part of the points
            if (!baseline || (baseline.from === 0 && baseline.to === line.values.length - 1)) return;
            const x0 = u.valToPos(baseline.from - 0.5, 'x', true);
            const x1 = u.valToPos(baseline.to + 0.5, 'x', true);
            u.ctx.save();
            u.ctx.fillStyle = WAIT_TINT;
            u.ctx.fillRect(x0, u.bbox.top, x1 - x0, u.bbox.height);
            u.ctx.restore();
          },
        ],
        draw: [
          (u) => {
            if (zoned) {
              for (const k of [-2, -1, 1, 2]) hLine(u, line.centre + k * line.sigma, { color: RULE, dash: [2, 4] });
            }
            hLine(u, line.centre, { color: INK, text: `Centre ${fixed(line.centre, digits)}` });
            hLine(u, line.upper, {
              color: BAD,
              dash: [7, 4],
              width: 1.5,
              text: `Upper limit ${fixed(line.upper, digits)}`,
            });
            hLine(u, line.lower, {
              color: BAD,
              dash: [7, 4],
              width: 1.5,
              text: `Lower limit ${fixed(line.lower, digits)}`,
            });
            const ctx = u.ctx;
            const r = 6 * devicePixelRatio;
            ctx.save();
            ctx.font = `bold ${11 * devicePixelRatio}px "IBM Plex Sans", sans-serif`;
            ctx.textAlign = 'center';
            for (const [i, rules] of flagged) {
              const v = line.values[i];
              if (v === null || v === undefined) continue;
              const x = u.valToPos(i, 'x', true);
              const y = u.valToPos(v, 'y', true);
              ctx.beginPath();
              ctx.moveTo(x, y - r);
              ctx.lineTo(x + r, y);
              ctx.lineTo(x, y + r);
              ctx.lineTo(x - r, y);
              ctx.closePath();
              ctx.fillStyle = BAD;
              ctx.fill();
              ctx.strokeStyle = '#ffffff';
              ctx.lineWidth = devicePixelRatio;
              ctx.stroke();
              ctx.fillStyle = BAD;
              ctx.fillText(rules.join(','), x, y - r - 3 * devicePixelRatio);
            }
            ctx.restore();
          },
        ],
        setCursor: [(u) => setAt(u.cursor.idx ?? null)],
      },
    };
  }, [line, points, baseline, flagged, zoned, digits]);

  const shown = at !== null ? points[at] : null;
  const value = at !== null ? line.values[at] : null;
  const u = unit ? ` ${unit}` : '';
  return (
    <figure className="flex flex-col gap-1">
      <Plot
        options={options}
        data={data}
        label={`${line.label}: ${points.length} points, centre ${fixed(line.centre, digits)}${u}, limits ${fixed(line.lower, digits)} to ${fixed(line.upper, digits)}${u}, ${flagged.size} flagged. The numbers are in the table below the chart.`}
      />
      <figcaption className="min-h-6 font-mono text-sm text-ink-soft">
        {shown ? (
          <>
            Point {at! + 1}: {shown.serial}, {formatWhen(shown.at)} —{' '}
            {value === null ? 'no value' : `${fixed(value, digits)}${u}`}
            {flagged.has(at!) && (
              <span className="ml-2 font-sans font-semibold text-bad">◆ rule {flagged.get(at!)!.join(', ')}</span>
            )}
          </>
        ) : (
          <span className="font-sans">
            Point at a dot for its part, time and value. ◆ marks a signal, with its rule.
          </span>
        )}
      </figcaption>
    </figure>
  );
}
