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

/** z for a two-sided 95% interval (the 0.975 quantile of the standard normal). */
export const Z_95 = 1.959963984540054;

/**
 * Wilson score interval for a binomial proportion, without continuity correction (Wilson EB,
 * JASA 1927;22:209-212; method 3 in Newcombe RG, Stat Med 1998;17:857-872):
 * (p + z²/2n ± z·√(p(1-p)/n + z²/4n²)) / (1 + z²/n). Stays within 0 to 1 and is not zero-width
 * at 0/n or n/n, unlike the plain normal (Wald) interval. Null when n is 0.
 */
export function wilsonInterval(successes: number, n: number, z = Z_95): { low: number; high: number } | null {
  if (n <= 0) return null;
  const p = successes / n;
  const z2 = z * z;
  const denominator = 1 + z2 / n;
  const centre = (p + z2 / (2 * n)) / denominator;
  const half = (z / denominator) * Math.sqrt((p * (1 - p)) / n + z2 / (4 * n * n));
  return { low: Math.max(0, centre - half), high: Math.min(1, centre + half) };
}

/** A rate with its 95% Wilson interval: `count` of `known` (codes whose answer is known). */
export interface RateWithInterval {
  count: number;
  /** The denominator: codes whose answer is known (yes or no). */
  known: number;
  /** Codes in the group whose answer is not known yet (left out of the denominator). */
  unknown: number;
  rate: number | null;
  low: number | null;
  high: number | null;
}

/** The rate of `true` among the values that are not null, with its Wilson interval. */
export function rateWithInterval(values: readonly (boolean | null)[]): RateWithInterval {
  const known = values.filter((v) => v !== null).length;
  const count = values.filter((v) => v === true).length;
  const ci = wilsonInterval(count, known);
  return { count, known, unknown: values.length - known, rate: known === 0 ? null : count / known, low: ci?.low ?? null, high: ci?.high ?? null };
}

export const RATE_METHOD =
  '95% confidence intervals are Wilson score intervals (Wilson 1927; Newcombe 1998, method 3), which stay sensible for small groups and for rates near 0% or 100%.';
