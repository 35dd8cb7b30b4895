import { analyseMetalHistory, type MetalHistory, type MetalTest } from "@analysis/metals/episodes";
import { METALS, type Metal, type MetalThresholds } from "@analysis/metals/reading";
import type { Scope } from "../../scope";
import { metalReadings } from "../metal-readings";
import { observedSpans, poolProfiles, type ObservedSpan, type RouteBookProfiles } from "./rows";
import type { AnalyticsParams } from "./window";

/**
 * The rows most route-book questions share, read once per request: metal
 * readings (narrow, ordered by pool and time), pool profiles, each pool's
 * observed span, and the metal history the analysis core makes of them.
 */
export type MetalDataset = {
  metals: readonly Metal[];
  thresholds: MetalThresholds;
  readings: MetalTest[];
  book: RouteBookProfiles;
  spans: ObservedSpan[];
  history: MetalHistory;
};

export async function loadMetalDataset(scope: Scope, params: AnalyticsParams): Promise<MetalDataset> {
  const metals = params.metal ? [params.metal] : METALS;
  const [readings, book, spans] = await Promise.all([
    metalReadings({ scope }, { window: params.window, metals }),
    poolProfiles(scope),
    observedSpans(scope, params.window),
  ]);
  const history = analyseMetalHistory(readings, { thresholds: params.thresholds, metals });
  return { metals, thresholds: params.thresholds, readings, book, spans, history };
}

