import {
  analyseMetalHistory,
  type Episode,
  type MetalHistory,
  type MetalTest,
  type PoolObservation,
  type RecurrenceFinding,
} from "./episodes";
import { METALS, type Metal, type MetalThresholds } from "./reading";

/**
 * How tests are read for a metal history: "all" with every metal (a pool's
 * tests are those with any metal measured) or one metal alone (only the tests
 * where it was measured). Episode lengths and test counts differ between the
 * two, so both are kept.
 */
export type ReadAs = "all" | Metal;
export const READ_AS: readonly ReadAs[] = ["all", ...METALS];

/**
 * A kept episode. Read one metal alone, a pool's episodes of that metal are
 * most often exactly those of the all-metals reading (when every test reads
 * every metal), so they are kept once: on the "all" rows, marked `alone`, and
 * that metal's own reading keeps no rows for the pool. It halves the rows a
 * large import writes.
 */
export type KeptEpisode = Episode & { readAs: ReadAs; seq: number; alone: boolean };
/** "any" spans also name the latest test with the saturation index's four inputs: the last in test order, so the last entered of a tie. */
export type KeptSpan = PoolObservation & { readAs: ReadAs | "any"; latestBalanceAt?: number | null; latestBalanceTestId?: string | null };

/** A test as kept results read it: its metals and pH, and whether it carries the saturation index's four inputs. */
export type KeptInputTest = MetalTest & { balanceComplete?: boolean; ph?: number | null };

export const metalsReadAs = (readAs: ReadAs): readonly Metal[] => (readAs === "all" ? METALS : [readAs]);

/** The tests as they are read one way: only those with the metal(s) measured, other metals left out. */
export function testsReadAs(tests: readonly MetalTest[], readAs: ReadAs): MetalTest[] {
  if (readAs === "all") return tests.filter((t) => t.copper || t.iron || t.manganese);
  const read: MetalTest[] = [];
  for (const t of tests) {
    const reading = t[readAs];
    if (reading) read.push({ id: t.id, poolId: t.poolId, takenAt: t.takenAt, [readAs]: reading });
  }
  return read;
}

/**
 * What is kept of some pools' tests under one set of levels: each reading's
 * episodes in the order the analysis finds them, and each pool's observed
 * span (every test, with its latest complete balance test, and each
 * reading). `tests` holds every test of the pools
 * (any analyte), ordered by pool, time and id.
 */
export function keptRowsOf(tests: readonly KeptInputTest[], thresholds: MetalThresholds): { episodes: KeptEpisode[]; spans: KeptSpan[] } {
  const episodes: KeptEpisode[] = [];
  const spans: KeptSpan[] = [];
  let current = null as KeptSpan | null;
  for (const t of tests) {
    if (current?.poolId !== t.poolId) {
      current = {
        readAs: "any",
        poolId: t.poolId,
        firstTestAt: t.takenAt,
        lastTestAt: t.takenAt,
        tests: 0,
        latestBalanceAt: null,
        latestBalanceTestId: null,
      };
      spans.push(current);
    }
    current.lastTestAt = t.takenAt;
    current.tests++;
    if (t.balanceComplete) {
      current.latestBalanceAt = t.takenAt;
      current.latestBalanceTestId = t.id;
    }
  }
  // A pool's all-metals episodes, to compare each metal's with the metal read alone.
  const ofPool = new Map<string, KeptEpisode[]>();
  for (const readAs of READ_AS) {
    // A metal read alone: the tests that measured it, as they are. The analysis reads only the metals it is
    // asked for, so its episodes and spans are those of testsReadAs, without a copy of every test.
    const readings = readAs === "all" ? testsReadAs(tests, readAs) : tests.filter((t) => t[readAs]);
    const read = numbered(analyseMetalHistory(readings, { thresholds, metals: metalsReadAs(readAs) }), readAs);
    if (readAs === "all") {
      for (const e of read.episodes) {
        episodes.push(e);
        const list = ofPool.get(e.poolId);
        if (list) list.push(e);
        else ofPool.set(e.poolId, [e]);
      }
    } else {
      for (let from = 0; from < read.episodes.length;) {
        let to = from + 1;
        while (to < read.episodes.length && read.episodes[to]!.poolId === read.episodes[from]!.poolId) to++;
        const alone = read.episodes.slice(from, to);
        const together = (ofPool.get(alone[0]!.poolId) ?? []).filter((e) => e.metal === readAs);
        if (sameEpisodes(alone, together)) for (const e of together) e.alone = true;
        else for (const e of alone) episodes.push(e);
        from = to;
      }
    }
    for (const p of read.pools) spans.push({ readAs, poolId: p.poolId, firstTestAt: p.firstTestAt, lastTestAt: p.lastTestAt, tests: p.tests });
  }
  return { episodes, spans };
}

/**
 * One reading's episodes numbered pool by pool, in the order the analysis
 * found them, and its pools. The episodes are the analysis's own objects,
 * made kept episodes in place: an import keeps a hundred thousand of them.
 */
function numbered(history: MetalHistory, readAs: ReadAs): { episodes: KeptEpisode[]; pools: MetalHistory["pools"] } {
  let seq = 0;
  let pool: string | null = null;
  const episodes = history.episodes as KeptEpisode[];
  for (const e of episodes) {
    seq = e.poolId === pool ? seq + 1 : 0;
    pool = e.poolId;
    e.readAs = readAs;
    e.seq = seq;
    e.alone = false;
  }
  return { episodes, pools: history.pools };
}

const EPISODE_FACTS = [
  "metal",
  "openedAt",
  "openedByTestId",
  "closedAt",
  "closedByTestId",
  "censored",
  "endAt",
  "durationDays",
  "peak",
  "testCount",
  "chronic",
  "recurrence",
] as const;

function sameEpisodes(a: readonly Episode[], b: readonly Episode[]): boolean {
  return a.length === b.length && a.every((e, i) => EPISODE_FACTS.every((fact) => e[fact] === b[i]![fact]));
}

/**
 * One reading's episodes from kept rows, as the kept read gives them: a
 * metal's own rows, and the all-metals rows of that metal marked `alone`;
 * ordered by pool (as a number) and seq.
 */
export function episodesReadAs(kept: readonly KeptEpisode[], readAs: ReadAs): Episode[] {
  return kept
    .filter((e) => e.readAs === readAs || (readAs !== "all" && e.readAs === "all" && e.alone && e.metal === readAs))
    .sort((a, b) => Number(a.poolId) - Number(b.poolId) || a.seq - b.seq)
    .map(({ readAs: _readAs, seq: _seq, alone: _alone, ...e }) => e);
}

/**
 * The metal history the analysis would find, rebuilt from kept rows of one
 * reading (episodes ordered by pool and seq, spans ordered by pool). Openings
 * and recurrence are the episodes' own; suspicions need the hardness
 * endpoint, which route-book reads leave out, so there are none.
 */
export function historyFromKept(episodes: readonly Episode[], spans: readonly PoolObservation[], metals: readonly Metal[]): MetalHistory {
  const recurrence: RecurrenceFinding[] = [];
  const byPool = new Map<string, Episode[]>();
  for (const e of episodes) {
    const list = byPool.get(e.poolId);
    if (list) list.push(e);
    else byPool.set(e.poolId, [e]);
  }
  for (const span of spans) {
    const poolEpisodes = byPool.get(span.poolId);
    if (!poolEpisodes) continue;
    for (const metal of metals) {
      let openings = 0;
      let firstRecurrenceAt: number | null = null;
      for (const e of poolEpisodes) {
        if (e.metal !== metal) continue;
        openings++;
        if (e.recurrence && (firstRecurrenceAt === null || e.openedAt < firstRecurrenceAt)) firstRecurrenceAt = e.openedAt;
      }
      if (openings > 0) recurrence.push({ poolId: span.poolId, metal, openings, recurrent: firstRecurrenceAt !== null, firstRecurrenceAt });
    }
  }
  return { episodes: [...episodes], recurrence, suspicions: [], pools: [...spans] };
}
