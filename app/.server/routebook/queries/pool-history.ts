import { TZDate } from "@date-fns/tz";
import { and, count, desc, eq, gte, lt, max, min } from "drizzle-orm";
import type { PoolHistoryQuery } from "~/lib/pool-history";
import { db } from "../../db/client";
import { user, waterTests } from "../../db/schema";
import type { Scope } from "../../scope";
import { anyMetalMeasured } from "../../analytics/queries/metal-readings";

export const HISTORY_PAGE_SIZE = 25;

/** The first instant of a calendar year in the company's time zone. */
const yearStart = (year: number, timeZone: string) => new Date(new TZDate(year, 0, 1, timeZone).getTime());

/**
 * One page of a pool's water tests, newest first (25 a page), narrowed to a
 * year of the company's calendar and to tests with a metal reading when
 * asked; with the total and the years that hold any test, for the filter.
 * The caller has already checked the pool is in the member's scope.
 */
export async function poolTestHistory(scope: Scope, poolId: number, query: PoolHistoryQuery) {
  const ofPool = and(eq(waterTests.companyId, scope.companyId), eq(waterTests.poolId, poolId));
  const where = and(
    ofPool,
    query.year ? gte(waterTests.sampledAt, yearStart(query.year, scope.timeZone)) : undefined,
    query.year ? lt(waterTests.sampledAt, yearStart(query.year + 1, scope.timeZone)) : undefined,
    query.metalOnly ? anyMetalMeasured() : undefined,
  );
  const [rows, [counted], [span]] = await Promise.all([
    db()
      .select({ test: waterTests, technicianName: user.name })
      .from(waterTests)
      .leftJoin(user, eq(user.id, waterTests.technicianId))
      .where(where)
      .orderBy(desc(waterTests.sampledAt), desc(waterTests.id))
      .limit(HISTORY_PAGE_SIZE)
      .offset((query.page - 1) * HISTORY_PAGE_SIZE),
    db().select({ total: count() }).from(waterTests).where(where),
    db().select({ first: min(waterTests.sampledAt), last: max(waterTests.sampledAt) }).from(waterTests).where(ofPool),
  ]);
  const yearOf = (at: Date) => new TZDate(at.getTime(), scope.timeZone).getFullYear();
  const years: number[] = [];
  if (span?.first && span.last) for (let y = yearOf(span.last); y >= yearOf(span.first); y--) years.push(y);
  const total = counted?.total ?? 0;
  return {
    tests: rows.map(({ test, technicianName }) => ({ ...test, technicianName })),
    total,
    page: query.page,
    pages: Math.max(1, Math.ceil(total / HISTORY_PAGE_SIZE)),
    years,
  };
}
