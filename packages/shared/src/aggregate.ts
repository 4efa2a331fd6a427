/**
 * Medians, interquartile ranges and shares across codes, for the committee's monthly review.
 *
 * Quantile method: linear interpolation between closest ranks (Hyndman & Fan type 7, the
 * default of R's quantile(), NumPy's percentile() and Excel's PERCENTILE.INC): for sorted
 * values x[0..n-1], q(p) = x[h] + (h - floor(h)) * (x[floor(h)+1] - x[floor(h)]), h = (n-1)p.
 */

export interface QuantileSummary {
  /** How many values (nulls left out). */
  n: number;
  median: number | null;
  /** First quartile (25th percentile). */
  q1: number | null;
  /** Third quartile (75th percentile). */
  q3: number | null;
}

export interface Share {
  /** Codes the target applies to. */
  applicable: number;
  met: number;
  /** met / applicable, 0 to 1; null when nothing applies. */
  share: number | null;
}

/** Type 7 quantile of already sorted values. */
export function quantileSorted(sorted: readonly number[], p: number): number | null {
  if (sorted.length === 0) return null;
  const h = (sorted.length - 1) * p;
  const lo = Math.floor(h);
  const a = sorted[lo] as number;
  const b = sorted[Math.min(lo + 1, sorted.length - 1)] as number;
  return a + (h - lo) * (b - a);
}

export function quantileSummary(values: readonly (number | null | undefined)[]): QuantileSummary {
  const sorted = values.filter((v): v is number => typeof v === 'number' && Number.isFinite(v)).sort((a, b) => a - b);
  return {
    n: sorted.length,
    median: quantileSorted(sorted, 0.5),
    q1: quantileSorted(sorted, 0.25),
    q3: quantileSorted(sorted, 0.75),
  };
}

/** Share of `met === true` among the values that are not null (null: the target does not apply). */
export function shareOf(values: readonly (boolean | null)[]): Share {
  const applicable = values.filter((v) => v !== null).length;
  const met = values.filter((v) => v === true).length;
  return { applicable, met, share: applicable === 0 ? null : met / applicable };
}

export interface HistogramBin {
  /** Inclusive lower edge. */
  from: number;
  /** Exclusive upper edge (the last bin includes it). */
  to: number;
  label: string;
  count: number;
}

/** Counts values into bins with the given edges; values outside the edges are left out. */
export function histogram(values: readonly (number | null)[], edges: readonly number[], label: (from: number, to: number) => string): HistogramBin[] {
  const bins: HistogramBin[] = [];
  for (let i = 0; i + 1 < edges.length; i++) {
    const from = edges[i] as number;
    const to = edges[i + 1] as number;
    bins.push({ from, to, label: label(from, to), count: 0 });
  }
  for (const v of values) {
    if (v === null || !Number.isFinite(v)) continue;
    const last = bins.length - 1;
    const i = bins.findIndex((b, idx) => v >= b.from && (v < b.to || (idx === last && v <= b.to)));
    if (i >= 0) (bins[i] as HistogramBin).count += 1;
  }
  return bins;
}

/** Compression-fraction bins the stats page shows: under 60% (below the AHA minimum), then by 10 points. */
export const COMPRESSION_FRACTION_EDGES = [0, 0.6, 0.7, 0.8, 0.9, 1] as const;
