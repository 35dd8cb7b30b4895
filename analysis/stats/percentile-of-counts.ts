/**
 * The p-quantile of values given as ascending (value, count) pairs, by linear
 * interpolation between order statistics at position p x (n - 1), as
 * PERCENTILE_CONT and the usual "type 7" definition do (Hyndman and Fan 1996).
 */
export function percentileOfCounts(sorted: ReadonlyArray<{ value: number; n: number }>, total: number, p: number): number {
  const position = p * (total - 1);
  const below = Math.floor(position);
  const valueAt = (rank: number) => {
    let seen = 0;
    for (const item of sorted) {
      seen += item.n;
      if (rank < seen) return item.value;
    }
    return sorted[sorted.length - 1]!.value;
  };
  const low = valueAt(below);
  return position === below ? low : low + (position - below) * (valueAt(below + 1) - low);
}
