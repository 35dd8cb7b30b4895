import { z } from "zod";

/** The pool page's history filter, as its URL carries it: ?page=2&year=2025&metal=only. */
export const poolHistoryQuery = z.object({
  page: z.coerce
    .number({ error: "page: give a whole page number, 1 or more." })
    .int({ error: "page: give a whole page number, 1 or more." })
    .min(1, { error: "page: give a whole page number, 1 or more." })
    .max(100_000, { error: "page: at most 100,000." })
    .default(1),
  year: z.coerce
    .number({ error: "year: give a year such as 2025." })
    .int({ error: "year: give a year such as 2025." })
    .min(1900, { error: "year: give a year from 1900 to 2200." })
    .max(2200, { error: "year: give a year from 1900 to 2200." })
    .optional(),
  metal: z.enum(["only"], { error: 'metal: the only choice is "only" (metal tests only).' }).optional(),
});

export type PoolHistoryQuery = { page: number; year: number | undefined; metalOnly: boolean };

/** Reads the filter from a URL; an empty value counts as absent. A problem comes back as one message naming the parameter. */
export function readPoolHistoryQuery(url: URL): { ok: true; query: PoolHistoryQuery } | { ok: false; message: string } {
  const raw = Object.fromEntries([...url.searchParams.entries()].filter(([key, value]) => ["page", "year", "metal"].includes(key) && value !== ""));
  const parsed = poolHistoryQuery.safeParse(raw);
  if (!parsed.success) return { ok: false, message: parsed.error.issues[0]?.message ?? "The history filter is not valid." };
  return { ok: true, query: { page: parsed.data.page, year: parsed.data.year, metalOnly: parsed.data.metal === "only" } };
}
