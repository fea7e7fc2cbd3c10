import { useEffect, useRef, useState } from 'react';
import uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';

/**
 * uPlot in a React box: made once per set of options, resized with its box, destroyed on unmount.
 * Canvas only, so every chart on the page comes with its numbers as a table beside it.
 */

// the palette's state colours (tailwind.config.ts), for drawing on the canvas
export const INK = '#1d2124';
export const INK_SOFT = '#4b5055';
export const RULE = '#8c877b';
export const ACCENT = '#0f5362';
export const BAD = '#a3262a';
export const BAD_TINT = '#f8e7e3';
export const WAIT_TINT = '#e6e8f2';

export function Plot({
  options,
  data,
  label,
  height = 230,
}: {
  options: Omit<uPlot.Options, 'width' | 'height'>;
  data: uPlot.AlignedData;
  label: string;
  height?: number;
}) {
  const box = useRef<HTMLDivElement>(null);
  const [width, setWidth] = useState(0);

  useEffect(() => {
    const el = box.current;
    if (!el) return;
    const observer = new ResizeObserver(([entry]) => setWidth(Math.floor(entry!.contentRect.width)));
    observer.observe(el);
    return () => observer.disconnect();
  }, []);

  useEffect(() => {
    const el = box.current;
    if (!el || width < 50) return;
    const plot = new uPlot({ ...options, width, height }, data, el);
    return () => plot.destroy();
  }, [options, data, width, height]);

  return <div ref={box} role="img" aria-label={label} className="w-full" style={{ minHeight: height }} />;
}

/** A horizontal line across the plotting area at a value, with a word at its right end. */
export function hLine(
  u: uPlot,
  value: number,
  { color, dash = [], width = 1, text }: { color: string; dash?: number[]; width?: number; text?: string },
) {
  const ctx = u.ctx;
  const y = Math.round(u.valToPos(value, 'y', true));
  const { left, width: w } = u.bbox;
  ctx.save();
  ctx.strokeStyle = color;
  ctx.lineWidth = width * devicePixelRatio;
  ctx.setLineDash(dash.map((d) => d * devicePixelRatio));
  ctx.beginPath();
  ctx.moveTo(left, y);
  ctx.lineTo(left + w, y);
  ctx.stroke();
  if (text) {
    ctx.setLineDash([]);
    ctx.fillStyle = color;
    ctx.font = `${11 * devicePixelRatio}px "IBM Plex Sans", sans-serif`;
    ctx.textAlign = 'right';
    ctx.textBaseline = 'bottom';
    ctx.fillText(text, left + w - 3 * devicePixelRatio, y - 2 * devicePixelRatio);
  }
  ctx.restore();
}
