import { useMemo, type ReactNode } from 'react';
import uPlot from 'uplot';
import { ACCENT, INK_SOFT, Plot, RULE } from '../spc/plot';

/**
 * Bars for counts or yields over categories (stages, weeks, defect codes), drawn with the same uPlot
 * wrapper as the control charts. Canvas only: the numbers always sit one click away below it.
 */
export function BarChart({
  labels,
  values,
  label,
  percent = false,
  height = 220,
}: {
  labels: string[];
  values: (number | null)[];
  label: string;
  percent?: boolean;
  height?: number;
}) {
  const data = useMemo<uPlot.AlignedData>(() => [labels.map((_, i) => i), values], [labels, values]);
  const options = useMemo<Omit<uPlot.Options, 'width' | 'height'>>(
    () => ({
      legend: { show: false },
      cursor: { show: false },
      scales: {
        x: { time: false, range: [-0.6, Math.max(labels.length - 0.4, 0.6)] },
        y: { range: percent ? [0, 100] : (_u, _min, max) => [0, Math.max(1, max * 1.1)] },
      },
      axes: [
        {
          stroke: INK_SOFT,
          grid: { show: false },
          splits: () => labels.map((_, i) => i),
          values: (_u, splits) => splits.map((i) => labels[i] ?? ''),
          rotate: labels.length > 8 ? -40 : 0,
          size: labels.length > 8 ? 110 : 40,
        },
        {
          stroke: INK_SOFT,
          grid: { stroke: RULE, width: 0.5 },
          values: (_u, s) => s.map((v) => (percent ? `${v} %` : `${v}`)),
        },
      ],
      series: [
        {},
        { stroke: ACCENT, fill: `${ACCENT}cc`, paths: uPlot.paths.bars!({ size: [0.7, 60] }), points: { show: false } },
      ],
    }),
    [labels, percent],
  );
  if (labels.length === 0) return null;
  return <Plot options={options} data={data} label={label} height={height} />;
}

/** A chart and, one click away, the very numbers it draws. */
export function ChartNumbers({ children, numbers }: { children: ReactNode; numbers: ReactNode }) {
  return (
    <>
      {children}
      <details className="mt-2">
        <summary className="min-h-11 floor:min-h-12 cursor-pointer py-2 text-accent underline-offset-4 hover:underline">
          Show the numbers
        </summary>
        {numbers}
      </details>
    </>
  );
}
