import type { MetalTest } from "./episodes";
import { METALS, metalStatus, type Metal, type MetalThresholds } from "./reading";

export type PoolMetalState = "open" | "clear" | "not-tested";

export type MetalStateOfPool = Record<Metal, { state: PoolMetalState; lastTestedAt: number | null }>;

/**
 * Each pool's state per metal after its readings, which come ordered by pool,
 * time and id (the order the episode analysis reads them in). A metal is open
 * when its last reading that was elevated or clear was elevated: only an
 * elevated reading opens an episode and only a clear one closes it, so this is
 * "an episode of the metal, read alone, is still open" (censored). Readings
 * between the levels and "<x" above the clear level leave the state as it is.
 *
 * The order, not the time, decides: two tests of one pool may share an
 * instant, and then the later one in (time, id) order is the one that counts,
 * as it is for the episodes.
 */
export function poolMetalStates(readings: readonly MetalTest[], thresholds: MetalThresholds): Map<string, MetalStateOfPool> {
  const states = new Map<string, MetalStateOfPool>();
  const open = new Map<string, Record<Metal, boolean>>();
  for (const r of readings) {
    let state = states.get(r.poolId);
    let isOpen = open.get(r.poolId);
    if (!state || !isOpen) {
      state = notTested();
      isOpen = { copper: false, iron: false, manganese: false };
      states.set(r.poolId, state);
      open.set(r.poolId, isOpen);
    }
    for (const metal of METALS) {
      const reading = r[metal];
      if (!reading) continue;
      state[metal].lastTestedAt = r.takenAt;
      const status = metalStatus(reading, thresholds[metal]);
      if (status === "elevated") isOpen[metal] = true;
      else if (status === "clear") isOpen[metal] = false;
      state[metal].state = isOpen[metal] ? "open" : "clear";
    }
  }
  return states;
}

export function notTested(): MetalStateOfPool {
  return {
    copper: { state: "not-tested", lastTestedAt: null },
    iron: { state: "not-tested", lastTestedAt: null },
    manganese: { state: "not-tested", lastTestedAt: null },
  };
}
