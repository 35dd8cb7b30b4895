// The four-week metal outlook: a logistic model per metal fitted on the
// company's own history, proven by a rolling-origin backtest against simply
// ranking by the latest reading, and today's list with its reasons.
import { DAY_MS } from "../metals/episodes";
import { METALS, type Metal } from "../metals/reading";
import { FEATURES, featureRow, HORIZON_DAYS, prepareHistory, type AheadHistory, type FeatureRow, type PreparedHistory } from "./features";
import { contributions, fitLogistic, predictProbability, type LogisticModel } from "./logistic";
import { topReasons, type Reason } from "./reasons";
import { brierScore, calibrationTable, skillScore, topShareCatch, type CalibrationBin } from "./scores";

export interface OutlookOptions {
  metals?: readonly Metal[];
  /** Weekly origins tested, the most recent ones (default 52). */
  maxOrigins?: number;
  /** L2 penalty on standardised coefficients (default 1). */
  ridge?: number;
  /** Share of pool-metals flagged at each origin (default 0.1). */
  topShare?: number;
  /** Fewest openings in a metal's training rows before a model is fitted for it (default 5). */
  minOpenings?: number;
}

export interface RankingCatch {
  /** Openings found among the flagged, summed over the origins (ties at the cut counted fractionally). */
  caught: number;
  openings: number;
  share: number;
}

export interface Backtest {
  origins: number;
  firstOrigin: number | null;
  lastOrigin: number | null;
  forecasts: number;
  openings: number;
  baseRate: number;
  brier: number;
  baseRateBrier: number;
  skill: number;
  calibration: CalibrationBin[];
  topShare: number;
  model: RankingCatch;
  latestReading: RankingCatch;
  /** The model caught more openings than the latest-reading ranking and scored better than the base rate. */
  modelWins: boolean;
}

export type OutlookMethod = "model" | "latest-reading";

export interface OutlookEntry {
  poolId: string;
  metal: Metal;
  /** The model's chance of an opening within the horizon; null when the list is ranked by the latest reading. */
  probability: number | null;
  latestValue: number | null;
  latestAt: number | null;
  /** Flagged: in the top share of the company's pool-metals today. */
  flagged: boolean;
  reasons: Reason[];
}

export interface Outlook {
  asOf: number;
  horizonDays: number;
  method: OutlookMethod;
  /** Why the method was chosen, in words. */
  methodNote: string;
  backtest: Backtest | null;
  entries: OutlookEntry[];
  /** Per metal, the fitted model's coefficients on standardised features (null when the metal had too few openings). */
  coefficients: Record<string, Record<string, number> | null>;
}

/** Instants a week apart, ending at asOf, oldest first. */
export function weeklyInstants(asOf: number, earliest: number): number[] {
  const out: number[] = [];
  for (let at = asOf; at >= earliest; at -= 7 * DAY_MS) out.push(at);
  return out.reverse();
}

/** Identical training rows of one instant, counted once with their number as weight. */
type TrainingGroup = { metal: Metal; values: number[]; outcome: number; weight: number };
type RowsAt = { at: number; rows: FeatureRow[]; training: TrainingGroup[] };

/**
 * The at-risk rows (pool on the book, no episode of the metal open) at each
 * instant, and those with a known outcome folded into weighted groups: many
 * pools look alike in a given week, and the fit is the same on the groups.
 */
async function rowsByInstant(prepared: PreparedHistory, instants: readonly number[], pause: Pause): Promise<RowsAt[]> {
  const poolIds = [...prepared.testTimesByPool.keys()];
  const out: RowsAt[] = [];
  for (const at of instants) {
    await pause();
    const rows: FeatureRow[] = [];
    const groups = new Map<string, TrainingGroup>();
    for (const poolId of poolIds) {
      for (const metal of prepared.metals) {
        const row = featureRow(prepared, poolId, metal, at);
        if (!row || row.episodeOpen) continue;
        rows.push(row);
        if (row.outcome === null) continue;
        const key = `${metal}|${row.outcome}|${row.values.join(",")}`;
        const group = groups.get(key);
        if (group) group.weight++;
        else groups.set(key, { metal, values: row.values, outcome: row.outcome, weight: 1 });
      }
    }
    out.push({ at, rows, training: [...groups.values()] });
  }
  return out;
}

type MetalModel = { model: LogisticModel | null; baseRate: number };

function fitMetal(groups: readonly TrainingGroup[], ridge: number, minOpenings: number, start: LogisticModel | null): MetalModel {
  let rows = 0;
  let openings = 0;
  for (const g of groups) {
    rows += g.weight;
    openings += g.outcome * g.weight;
  }
  const baseRate = rows === 0 ? 0 : openings / rows;
  if (openings < minOpenings || rows - openings < minOpenings) return { model: null, baseRate };
  const model = fitLogistic(
    groups.map((g) => g.values),
    groups.map((g) => g.outcome),
    { ridge, weights: groups.map((g) => g.weight), ...(start ? { start } : {}) },
  );
  return { model, baseRate };
}

const chance = (fit: MetalModel, row: FeatureRow) => (fit.model ? predictProbability(fit.model, row.values) : fit.baseRate);

function fitAll(groups: readonly TrainingGroup[], metals: readonly Metal[], options: Required<OutlookOptions>, previous?: Map<Metal, MetalModel>) {
  const fits = new Map<Metal, MetalModel>();
  for (const metal of metals) {
    fits.set(
      metal,
      fitMetal(
        groups.filter((g) => g.metal === metal),
        options.ridge,
        options.minOpenings,
        previous?.get(metal)?.model ?? null,
      ),
    );
  }
  return fits;
}

function summariseCatch(parts: { caught: number; events: number }[]): RankingCatch {
  const caught = parts.reduce((n, p) => n + p.caught, 0);
  const openings = parts.reduce((n, p) => n + p.events, 0);
  return { caught, openings, share: openings === 0 ? 0 : caught / openings };
}

/**
 * Rolling origin: at each weekly origin, fit on every row whose four weeks
 * ended before the origin, forecast the origin's rows, then step a week.
 */
async function runBacktest(
  byInstant: readonly RowsAt[],
  asOf: number,
  metals: readonly Metal[],
  options: Required<OutlookOptions>,
  pause: Pause,
): Promise<Backtest | null> {
  const horizonMs = HORIZON_DAYS * DAY_MS;
  const candidates = byInstant.filter((b) => b.at + horizonMs <= asOf);
  const origins = candidates.slice(-options.maxOrigins);
  const scored: { probability: number; base: number; simple: number; outcome: number }[] = [];
  const modelCatch: { caught: number; events: number }[] = [];
  const simpleCatch: { caught: number; events: number }[] = [];
  let used = 0;
  let firstOrigin: number | null = null;
  let lastOrigin: number | null = null;
  let previous: Map<Metal, MetalModel> | undefined;
  for (const origin of origins) {
    await pause();
    const training = byInstant.filter((b) => b.at + horizonMs <= origin.at).flatMap((b) => b.training);
    if (training.length === 0) continue;
    const fits = fitAll(training, metals, options, previous);
    if (![...fits.values()].some((f) => f.model)) continue;
    previous = fits;
    const rows = origin.rows.filter((r) => r.outcome !== null);
    if (rows.length === 0) continue;
    used++;
    firstOrigin ??= origin.at;
    lastOrigin = origin.at;
    const here = rows.map((row) => {
      const fit = fits.get(row.metal)!;
      return { probability: chance(fit, row), base: fit.baseRate, simple: row.values[0]!, outcome: row.outcome! };
    });
    scored.push(...here);
    modelCatch.push(topShareCatch(here.map((h) => ({ score: h.probability, outcome: h.outcome })), options.topShare));
    simpleCatch.push(topShareCatch(here.map((h) => ({ score: h.simple, outcome: h.outcome })), options.topShare));
  }
  if (used === 0) return null;
  const brier = brierScore(scored);
  const baseRateBrier = brierScore(scored.map((s) => ({ probability: s.base, outcome: s.outcome })));
  const model = summariseCatch(modelCatch);
  const latestReading = summariseCatch(simpleCatch);
  const openings = scored.reduce((n, s) => n + s.outcome, 0);
  return {
    origins: used,
    firstOrigin,
    lastOrigin,
    forecasts: scored.length,
    openings,
    baseRate: openings / scored.length,
    brier,
    baseRateBrier,
    skill: skillScore(brier, baseRateBrier),
    calibration: calibrationTable(scored),
    topShare: options.topShare,
    model,
    latestReading,
    modelWins: model.share > latestReading.share && brier < baseRateBrier,
  };
}

export const LATEST_READING_FEATURE = FEATURES.indexOf("latestReading");

/** Called between weeks of work, so a server can let other requests through (a resolved promise when nothing needs to wait). */
export type Pause = () => Promise<void>;
const noPause: Pause = () => Promise.resolve();

/** The outlook of a company's history as of `history.asOf`. */
export async function metalOutlook(history: AheadHistory, options: OutlookOptions = {}, pause: Pause = noPause): Promise<Outlook> {
  const resolved: Required<OutlookOptions> = {
    metals: options.metals ?? METALS,
    maxOrigins: options.maxOrigins ?? 52,
    ridge: options.ridge ?? 1,
    topShare: options.topShare ?? 0.1,
    minOpenings: options.minOpenings ?? 5,
  };
  const prepared = prepareHistory(history, resolved.metals);
  const earliest = Math.min(...[...prepared.testTimesByPool.values()].map((times) => times[0]!));
  const byInstant = Number.isFinite(earliest) ? await rowsByInstant(prepared, weeklyInstants(history.asOf, earliest), pause) : [];
  const backtest = await runBacktest(byInstant, history.asOf, resolved.metals, resolved, pause);

  const today = byInstant.at(-1)?.at === history.asOf ? byInstant.at(-1)!.rows : [];
  const method: OutlookMethod = backtest?.modelWins ? "model" : "latest-reading";
  const methodNote = !backtest
    ? "Too little history to test a model yet, so pools are ranked by their latest reading against the elevated level."
    : backtest.modelWins
      ? `On ${backtest.origins} past weeks the model found ${pct(backtest.model.share)} of the openings in its top ${pct(backtest.topShare)}, against ${pct(backtest.latestReading.share)} for ranking by the latest reading.`
      : `On ${backtest.origins} past weeks the model did not beat ranking by the latest reading (${pct(backtest.model.share)} against ${pct(backtest.latestReading.share)} of openings in the top ${pct(backtest.topShare)}, Brier score ${backtest.brier.toFixed(4)} against ${backtest.baseRateBrier.toFixed(4)} for the base rate), so pools are ranked by their latest reading.`;

  const coefficients: Outlook["coefficients"] = {};
  let entries: OutlookEntry[];
  if (method === "model") {
    const training = byInstant.flatMap((b) => b.training);
    const fits = fitAll(training, resolved.metals, resolved);
    for (const [metal, fit] of fits) {
      coefficients[metal] = fit.model ? Object.fromEntries(FEATURES.map((f, j) => [f, fit.model!.coefficients[j]!])) : null;
    }
    entries = today.map((row) => {
      const fit = fits.get(row.metal)!;
      const reasons = fit.model
        ? topReasons(contributions(fit.model, row.values), row.facts, row.metal, history.thresholds, row.at)
        : [];
      return entry(row, chance(fit, row), reasons);
    });
    entries.sort((a, b) => b.probability! - a.probability! || (b.latestValue ?? 0) - (a.latestValue ?? 0));
  } else {
    for (const metal of resolved.metals) coefficients[metal] = null;
    entries = today.map((row) => entry(row, null, [{ key: "reading", logOdds: 0, text: readingWords(row, history) }]));
    const ratio = (e: OutlookEntry) => (e.latestValue ?? 0) / history.thresholds[e.metal].elevated;
    entries.sort((a, b) => ratio(b) - ratio(a));
  }
  const flaggedCount = Math.ceil(entries.length * resolved.topShare);
  entries.forEach((e, i) => (e.flagged = i < flaggedCount));
  return { asOf: history.asOf, horizonDays: HORIZON_DAYS, method, methodNote, backtest, entries, coefficients };
}

function entry(row: FeatureRow, probability: number | null, reasons: Reason[]): OutlookEntry {
  return { poolId: row.poolId, metal: row.metal, probability, latestValue: row.facts.latestValue, latestAt: row.facts.latestAt, flagged: false, reasons };
}

function readingWords(row: FeatureRow, history: AheadHistory): string {
  const elevated = history.thresholds[row.metal].elevated;
  if (row.facts.latestValue === null) return "No reading on record yet";
  return `Latest reading ${Math.round((100 * row.facts.latestValue) / elevated)}% of the elevated level`;
}

const pct = (share: number) => `${Math.round(share * 100)}%`;
