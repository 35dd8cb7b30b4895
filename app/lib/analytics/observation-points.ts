import { DEFAULT_HEATER_AGE_EDGES, HEATING_KINDS, type PoolProfile } from "@analysis/metals/route-book";
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
  if (!CHANGES_OVER_TIME.has(key)) return firstAt === lastAt ? [firstAt] : [Math.min(firstAt, lastAt), Math.max(firstAt, lastAt)];
  const instants = new Set<number>([firstAt, lastAt]);
  for (const item of pool.equipment ?? []) {
    if (!HEATING_KINDS.includes(item.kind)) continue;
    const changes: number[] = [];
    if (item.installedAt !== null) changes.push(item.installedAt);
    if (item.removedAt !== null && item.removedAt !== undefined) changes.push(item.removedAt);
    if (key === "heater-age" && item.installedAt !== null) {
      const installed = new Date(item.installedAt);
      for (const years of ageEdges) {
        changes.push(Date.UTC(installed.getUTCFullYear() + years, installed.getUTCMonth(), installed.getUTCDate()));
      }
    }
    for (const at of changes) if (at > firstAt && at < lastAt) instants.add(at);
  }
  return [...instants].sort((a, b) => a - b);
}
