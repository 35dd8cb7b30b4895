import { DEFAULT_HEATER_AGE_EDGES, HEATING_KINDS, utcDateNumber, type PoolProfile } from "@analysis/metals/route-book";
import { CHANGES_OVER_TIME, type GroupingKey } from "@analysis/stats/groups";

/**
 * Instants that stand in for a pool's tests when its observed time is split
 * among groups: the first and last test, and, for keys that change with the
 * equipment (heater age, exchanger metal), every date inside the span where
 * the answer can change (an install, a removal, an age-bucket birthday).
 *
 * The group comparison credits the time up to the next instant to the group
 * at the earlier one, so these instants give exactly the time spent in each
 * group without reading every test of the pool from the database.
 */
export function observationInstants(
  pool: PoolProfile,
  firstAt: number,
  lastAt: number,
  key: GroupingKey,
  ageEdges: readonly number[] = DEFAULT_HEATER_AGE_EDGES,
): number[] {
  const instants = firstAt === lastAt ? [firstAt] : [Math.min(firstAt, lastAt), Math.max(firstAt, lastAt)];
  if (!CHANGES_OVER_TIME.has(key)) return instants;
  const ends = instants.length;
  for (const item of pool.equipment ?? []) {
    if (!HEATING_KINDS.includes(item.kind)) continue;
    if (item.installedAt !== null && item.installedAt > firstAt && item.installedAt < lastAt) instants.push(item.installedAt);
    if (item.removedAt !== null && item.removedAt !== undefined && item.removedAt > firstAt && item.removedAt < lastAt) instants.push(item.removedAt);
    if (key === "heater-age" && item.installedAt !== null) {
      const installed = utcDateNumber(item.installedAt);
      const [year, month, day] = [Math.floor(installed / 10_000), Math.floor(installed / 100) % 100, installed % 100];
      for (const years of ageEdges) {
        const birthday = Date.UTC(year + years, month - 1, day);
        if (birthday > firstAt && birthday < lastAt) instants.push(birthday);
      }
    }
  }
  if (instants.length === ends) return instants;
  instants.sort((a, b) => a - b);
  return instants.filter((at, i) => i === 0 || at !== instants[i - 1]);
}
