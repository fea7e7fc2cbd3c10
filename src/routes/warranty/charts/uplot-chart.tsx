import { useEffect, useRef, useState } from 'react';
import type uPlot from 'uplot';

/** The palette's own colours for a canvas, which cannot read the stylesheet's classes. */
export const CHART_COLOURS = {
  ink: '#1d2124',
  soft: '#4b5055',
  rule: '#d3cdc1',
  accent: '#0f5362',
  accentTint: '#9dbdc3',
  bad: '#a3262a',
  hold: '#7a4f00',
  wait: '#3f4a78',
};

export type UPlotCtor = typeof uPlot;
type Build = (lib: UPlotCtor, width: number) => uPlot.Options;

// uPlot and its stylesheet arrive with the first chart a page draws, never with the station screen
let loading: Promise<UPlotCtor> | null = null;
function loadUPlot(): Promise<UPlotCtor> {
  loading ??= Promise.all([import('uplot'), import('uplot/dist/uPlot.min.css')]).then(([m]) => m.default);
  return loading;
}

/**
 * One uPlot chart, drawn once its code has loaded and redrawn at the width of its box. `label`
 * names the picture for a screen reader; the numbers themselves are one click away beside it.
 */
export function UPlotChart({
  build,
  data,
  label,
  height = 320,
}: {
  build: Build;
  data: uPlot.AlignedData;
  label: string;
  height?: number;
}) {
  const box = useRef<HTMLDivElement>(null);
  const [failed, setFailed] = useState(false);
  const [ready, setReady] = useState(false);
  useEffect(() => {
    let chart: uPlot | null = null;
    let observer: ResizeObserver | null = null;
    let gone = false;
    loadUPlot()
      .then((lib) => {
        if (gone || !box.current) return;
        const width = Math.max(box.current.clientWidth, 280);
        chart = new lib({ ...build(lib, width), width, height }, data, box.current);
        setReady(true);
        observer = new ResizeObserver(() => {
          if (chart && box.current) chart.setSize({ width: Math.max(box.current.clientWidth, 280), height });
        });
        observer.observe(box.current);
      })
      .catch(() => setFailed(true));
    return () => {
      gone = true;
      observer?.disconnect();
      chart?.destroy();
    };
  }, [build, data, height]);
  return (
    <figure aria-label={label} className="m-0">
      <div ref={box} role="img" aria-label={label} className="w-full" style={{ minHeight: height }} />
      {!ready && !failed && <p className="text-ink-soft">Drawing the chart…</p>}
      {failed && <p className="text-bad">The chart could not be drawn here; its numbers are below.</p>}
    </figure>
  );
}
