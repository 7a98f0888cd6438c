// Percentiles as spreadsheet programs compute PERCENTILE.INC (Hyndman & Fan type 7, linear
// interpolation between closest ranks): the median of 1, 2, 3, 4 is 2.5.
export function percentile(sorted: readonly number[], p: number): number | null {
  const n = sorted.length;
  if (n === 0) return null;
  const h = (n - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, n - 1);
  return sorted[lo]! + (h - lo) * (sorted[hi]! - sorted[lo]!);
}
