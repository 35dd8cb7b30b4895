import { wilcoxonRankSum } from "simple-statistics";
import { normalCdf } from "./distributions";

export type Alternative = "two-sided" | "greater" | "less";

export interface RankTestResult {
  statistic: number;
  pValue: number;
  method: "exact" | "normal-approximation";
}

/** Exact tables are used up to this many observations per sample, when there are no ties. */
const EXACT_LIMIT = 50;

function midranks(values: readonly number[]): { ranks: number[]; tieSizes: number[] } {
  const order = values.map((v, i) => ({ v, i })).sort((a, b) => a.v - b.v);
  const ranks = new Array<number>(values.length);
  const tieSizes: number[] = [];
  let k = 0;
  while (k < order.length) {
    let end = k;
    while (end + 1 < order.length && order[end + 1]!.v === order[k]!.v) end++;
    const rank = (k + end) / 2 + 1;
    for (let j = k; j <= end; j++) ranks[order[j]!.i] = rank;
    if (end > k) tieSizes.push(end - k + 1);
    k = end + 1;
  }
  return { ranks, tieSizes };
}

function tailProbability(counts: readonly number[], statistic: number, alternative: Alternative): number {
  const total = counts.reduce((a, b) => a + b, 0);
  let upper = 0;
  let lower = 0;
  for (let s = 0; s < counts.length; s++) {
    if (s >= statistic) upper += counts[s]!;
    if (s <= statistic) lower += counts[s]!;
  }
  if (alternative === "greater") return upper / total;
  if (alternative === "less") return lower / total;
  return Math.min(1, (2 * Math.min(upper, lower)) / total);
}

function normalTail(z: number, alternative: Alternative): number {
  if (alternative === "greater") return 1 - normalCdf(z);
  if (alternative === "less") return normalCdf(z);
  return Math.min(1, 2 * (1 - normalCdf(Math.abs(z))));
}

function continuity(difference: number, alternative: Alternative): number {
  if (alternative === "greater") return difference - 0.5;
  if (alternative === "less") return difference + 0.5;
  return Math.sign(difference) * Math.max(0, Math.abs(difference) - 0.5);
}

/**
 * Wilcoxon signed-rank test on paired values (e.g. metal level before and
 * after treatment). V is the sum of ranks of the positive differences x - y;
 * zero differences are dropped.
 */
export function wilcoxonSignedRank(x: readonly number[], y: readonly number[], alternative: Alternative = "two-sided"): RankTestResult {
  if (x.length !== y.length) throw new Error("paired samples must have equal length");
  const differences = x.map((v, i) => v - y[i]!).filter((d) => d !== 0);
  const n = differences.length;
  if (n === 0) return { statistic: 0, pValue: 1, method: "exact" };
  const { ranks, tieSizes } = midranks(differences.map(Math.abs));
  const statistic = differences.reduce((sum, d, i) => (d > 0 ? sum + ranks[i]! : sum), 0);
  if (tieSizes.length === 0 && n <= EXACT_LIMIT) {
    // counts[s] = number of subsets of {1..n} whose ranks sum to s
    const maxSum = (n * (n + 1)) / 2;
    const counts = new Array<number>(maxSum + 1).fill(0);
    counts[0] = 1;
    for (let r = 1; r <= n; r++) for (let s = maxSum; s >= r; s--) counts[s]! += counts[s - r]!;
    return { statistic, pValue: tailProbability(counts, statistic, alternative), method: "exact" };
  }
  const mean = (n * (n + 1)) / 4;
  const variance = (n * (n + 1) * (2 * n + 1)) / 24 - tieSizes.reduce((s, t) => s + t ** 3 - t, 0) / 48;
  const z = continuity(statistic - mean, alternative) / Math.sqrt(variance);
  return { statistic, pValue: normalTail(z, alternative), method: "normal-approximation" };
}

/**
 * Mann-Whitney test (Wilcoxon rank-sum) for two independent samples, e.g.
 * percent reduction under two products. W = rank sum of x - nx(nx+1)/2.
 */
export function mannWhitney(x: readonly number[], y: readonly number[], alternative: Alternative = "two-sided"): RankTestResult {
  const m = x.length;
  const n = y.length;
  if (m === 0 || n === 0) return { statistic: NaN, pValue: NaN, method: "exact" };
  const statistic = wilcoxonRankSum([...x], [...y]) - (m * (m + 1)) / 2;
  const { tieSizes } = midranks([...x, ...y]);
  if (tieSizes.length === 0 && m <= EXACT_LIMIT && n <= EXACT_LIMIT) {
    // ways[i][j][u]: arrangements of i x's and j y's with u (x > y) pairs, folded over i.
    let previous: number[][] = Array.from({ length: n + 1 }, () => [1]);
    for (let i = 1; i <= m; i++) {
      const current: number[][] = [];
      for (let j = 0; j <= n; j++) {
        const size = i * j + 1;
        const row = new Array<number>(size).fill(0);
        const withoutX = j > 0 ? current[j - 1]! : null; // last element is a y
        const lastIsX = previous[j]!; // last (largest) element is an x: beats all j y's
        for (let u = 0; u < size; u++) {
          row[u] = (withoutX?.[u] ?? 0) + (u >= j ? lastIsX[u - j] ?? 0 : 0);
        }
        current.push(row);
      }
      previous = current;
    }
    return { statistic, pValue: tailProbability(previous[n]!, statistic, alternative), method: "exact" };
  }
  const N = m + n;
  const mean = (m * n) / 2;
  const tieTerm = tieSizes.reduce((s, t) => s + t ** 3 - t, 0) / (N * (N - 1));
  const variance = ((m * n) / 12) * (N + 1 - tieTerm);
  const z = continuity(statistic - mean, alternative) / Math.sqrt(variance);
  return { statistic, pValue: normalTail(z, alternative), method: "normal-approximation" };
}
