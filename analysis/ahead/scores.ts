// Verification of probability forecasts: Brier score, its base-rate reference,
// the calibration (reliability) table by tenths and Murphy's partition, and
// the share of events caught by the top of a ranking.

/** One forecast and what happened: 1 the event came, 0 it did not. */
export interface ScoredForecast {
  probability: number;
  outcome: number;
}

/**
 * Mean squared difference between forecast probability and outcome (the
 * two-outcome form of Brier 1950; Brier's own sum over both classes is twice this).
 */
export function brierScore(forecasts: readonly ScoredForecast[]): number {
  if (forecasts.length === 0) return Number.NaN;
  let sum = 0;
  for (const f of forecasts) sum += (f.probability - f.outcome) ** 2;
  return sum / forecasts.length;
}

/** 1 - score / reference score: above 0 means better than the reference forecast. */
export function skillScore(score: number, referenceScore: number): number {
  return referenceScore === 0 ? Number.NaN : 1 - score / referenceScore;
}

export interface CalibrationBin {
  /** Lower edge of the tenth, 0, 0.1, ..., 0.9; the last bin includes 1. */
  from: number;
  to: number;
  count: number;
  /** Mean forecast probability in the bin (null when empty). */
  meanPredicted: number | null;
  /** Share of the bin's forecasts followed by the event (null when empty). */
  observed: number | null;
  events: number;
}

export function calibrationTable(forecasts: readonly ScoredForecast[], bins = 10): CalibrationBin[] {
  const table = Array.from({ length: bins }, (_, k) => ({ from: k / bins, to: (k + 1) / bins, count: 0, sum: 0, events: 0 }));
  for (const f of forecasts) {
    const k = Math.min(bins - 1, Math.max(0, Math.floor(f.probability * bins)));
    const bin = table[k]!;
    bin.count++;
    bin.sum += f.probability;
    bin.events += f.outcome;
  }
  return table.map((b) => ({
    from: Number(b.from.toFixed(10)),
    to: Number(b.to.toFixed(10)),
    count: b.count,
    meanPredicted: b.count === 0 ? null : b.sum / b.count,
    observed: b.count === 0 ? null : b.events / b.count,
    events: b.events,
  }));
}

export interface BrierPartition {
  reliability: number;
  resolution: number;
  uncertainty: number;
}

/**
 * Murphy's (1973) partition over the calibration bins:
 * BS = reliability - resolution + uncertainty, exact when every forecast in a
 * bin has the same value (otherwise a small within-bin term is left over).
 */
export function brierPartition(table: readonly CalibrationBin[]): BrierPartition {
  const total = table.reduce((n, b) => n + b.count, 0);
  const events = table.reduce((n, b) => n + b.events, 0);
  const base = events / total;
  let reliability = 0;
  let resolution = 0;
  for (const b of table) {
    if (b.count === 0) continue;
    reliability += b.count * (b.meanPredicted! - b.observed!) ** 2;
    resolution += b.count * (b.observed! - base) ** 2;
  }
  return { reliability: reliability / total, resolution: resolution / total, uncertainty: base * (1 - base) };
}

export interface TopShareCatch {
  /** How many forecasts the top share flags (ceil of share x count). */
  flagged: number;
  /** Events among the flagged; ties at the cut share the remaining places evenly, so this may be fractional. */
  caught: number;
  events: number;
}

/**
 * Events found among the highest-ranked share of forecasts. Scores tied at the
 * cut are not ordered by accident of input order: each tied forecast gets the
 * same fraction of the places left, and is counted by that fraction.
 */
export function topShareCatch(scored: readonly { score: number; outcome: number }[], share = 0.1): TopShareCatch {
  const events = scored.reduce((n, s) => n + s.outcome, 0);
  const flagged = Math.ceil(scored.length * share);
  if (flagged === 0) return { flagged, caught: 0, events };
  const ordered = [...scored].sort((a, b) => b.score - a.score);
  const cut = ordered[flagged - 1]!.score;
  let caught = 0;
  let above = 0;
  let tied = 0;
  let tiedEvents = 0;
  for (const s of ordered) {
    if (s.score > cut) {
      above++;
      caught += s.outcome;
    } else if (s.score === cut) {
      tied++;
      tiedEvents += s.outcome;
    } else break;
  }
  caught += tiedEvents * ((flagged - above) / tied);
  return { flagged, caught, events };
}
