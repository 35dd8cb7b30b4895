/**
 * Episodes and recurrence over large synthetic route books.
 * Run: npx vitest bench --run --project unit tests/bench/analysis-episodes.bench.ts
 * (the unit project keeps the database projects' global setup out of the run).
 *
 * Sizes 100k, 250k and 500k tests: time per test should stay flat if the
 * computation is linear.
 */
import { bench, describe } from "vitest";
import { DAY_MS, analyseMetalHistory, type MetalTest } from "../../analysis/metals/episodes";
import type { MetalReading } from "../../analysis/metals/reading";
import type { PoolProfile } from "../../analysis/metals/route-book";
import { groupComparison } from "../../analysis/stats/groups";
import { sharedSourceAlerts } from "../../analysis/metals/shared-source";
import { seededRandom } from "../fixtures/seeded-random";

/**
 * Weekly tests for pools with about two years of history each. Each pool
 * drifts through spells of high metal, so episodes, closes and recurrences
 * all occur.
 */
function syntheticTests(count: number, seed: number): MetalTest[] {
  const random = seededRandom(seed);
  const testsPerPool = 104;
  const start = Date.UTC(2022, 0, 3);
  const tests: MetalTest[] = new Array(count);
  let copperLevel = 0;
  let ironLevel = 0;
  const reading = (level: number): MetalReading | null => {
    const roll = random();
    if (roll < 0.45) return null; // metals are not tested every visit
    if (level < 0.05 && roll < 0.6) return { value: 0.05, belowDetection: true };
    return { value: Math.round(level * 100) / 100, belowDetection: false };
  };
  for (let i = 0; i < count; i++) {
    const poolIndex = Math.floor(i / testsPerPool);
    const visit = i % testsPerPool;
    if (visit === 0) {
      copperLevel = random() * 0.2;
      ironLevel = random() * 0.15;
    }
    copperLevel = Math.max(0, copperLevel + (random() - 0.52) * 0.12 + (random() < 0.02 ? 0.4 : 0));
    ironLevel = Math.max(0, ironLevel + (random() - 0.52) * 0.08 + (random() < 0.015 ? 0.3 : 0));
    tests[i] = {
      id: `t${i}`,
      poolId: `pool-${poolIndex}`,
      takenAt: start + visit * 7 * DAY_MS + Math.floor(random() * 8 * 3_600_000),
      copper: reading(copperLevel),
      iron: reading(ironLevel),
      manganese: random() < 0.1 ? { value: Math.round(random() * 8) / 100, belowDetection: false } : null,
      hardnessEndpoint: random() < 0.03 ? "blurred" : "clean",
    };
  }
  return tests;
}

const sizes = [100_000, 250_000, 500_000];
const datasets = new Map(sizes.map((n) => [n, syntheticTests(n, 20240601)]));

const largest = analyseMetalHistory(datasets.get(500_000)!);
const shape = `${largest.episodes.length} episodes, ${largest.recurrence.filter((f) => f.recurrent).length} recurrent pool-metals at 500k`;

describe(`episodes and recurrence (${shape})`, () => {
  for (const n of sizes) {
    const tests = datasets.get(n)!;
    bench(`${n.toLocaleString("en-US")} tests, already ordered by pool and time`, () => {
      analyseMetalHistory(tests);
    }, { iterations: 5, warmupIterations: 1 });
  }
  const shuffled = [...datasets.get(500_000)!];
  const random = seededRandom(7);
  for (let i = shuffled.length - 1; i > 0; i--) {
    const j = Math.floor(random() * (i + 1));
    [shuffled[i], shuffled[j]] = [shuffled[j]!, shuffled[i]!];
  }
  bench("500,000 tests, shuffled (one sort first)", () => {
    analyseMetalHistory(shuffled);
  }, { iterations: 3, warmupIterations: 1 });
});

describe("route-book comparisons on the 500,000-test history", () => {
  const tests = datasets.get(500_000)!;
  const history = analyseMetalHistory(tests);
  const random = seededRandom(99);
  const pools: PoolProfile[] = history.pools.map((p, i) => ({
    poolId: p.poolId,
    fillSourceId: `source-${i % 40}`,
    fillSourceKind: i % 40 < 6 ? "shared-well" : "municipal",
    routeId: `route-${i % 25}`,
    equipment:
      random() < 0.6
        ? [{ id: `h${i}`, kind: "heater", exchangerMetal: random() < 0.5 ? "copper" : "titanium", installedAt: Date.UTC(2004 + Math.floor(random() * 20), 3, 1) }]
        : [],
  }));
  bench("group comparison by heater age at test date", () => {
    groupComparison(pools, tests, history.episodes, "heater-age");
  }, { iterations: 3, warmupIterations: 1 });
  bench("group comparison by fill source", () => {
    groupComparison(pools, tests, history.episodes, "fill-source");
  }, { iterations: 3, warmupIterations: 1 });
  bench("shared-source alerts", () => {
    sharedSourceAlerts(history.episodes, pools);
  }, { iterations: 5, warmupIterations: 1 });
});
