/** Latency figures from every sample, not from a histogram's buckets. */
export type Latency = { n: number; p50: number; p95: number; p99: number; max: number; mean: number };

export function percentile(sorted: number[], p: number): number {
  if (!sorted.length) return NaN;
  // nearest-rank: the smallest sample with at least p % of the samples at or below it
  const rank = Math.max(1, Math.ceil((p / 100) * sorted.length));
  return sorted[Math.min(rank, sorted.length) - 1]!;
}

export function summarize(samples: number[]): Latency {
  const s = [...samples].sort((a, b) => a - b);
  const sum = s.reduce((a, b) => a + b, 0);
  return {
    n: s.length,
    p50: percentile(s, 50),
    p95: percentile(s, 95),
    p99: percentile(s, 99),
    max: s.at(-1) ?? NaN,
    mean: s.length ? sum / s.length : NaN,
  };
}

/** One measured run at a fixed rate (`target`) or flat out (`target` null). */
export type Run = {
  target: number | null;
  /** Requests or transactions that fell due (at a fixed rate) or were sent (flat out). */
  sent: number;
  achieved: number;
  ok: number;
  errors: number;
  latency: Latency;
};

export const round = (x: number, digits = 1) => (Number.isFinite(x) ? Number(x.toFixed(digits)) : null);
