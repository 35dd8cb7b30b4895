import { plainPositiveInt } from "./strict-params";
import { z } from "zod";

export const PAGE_SIZE = 25;

/**
 * Sorting, search and paging of a route-book table, read from the URL so a
 * list can be bookmarked, shared and paged on a phone without client state.
 * Unknown sort keys fall back to the table's default rather than failing.
 */
export function listParams<const K extends readonly [string, ...string[]]>(url: URL, sortKeys: K, defaultSort: K[number]) {
  const search = url.searchParams;
  const sort = (sortKeys as readonly string[]).includes(search.get("sort") ?? "")
    ? (search.get("sort") as K[number])
    : defaultSort;
  const page = z.coerce.number().int().min(1).max(100_000).catch(1).parse(search.get("page") ?? 1);
  return {
    q: (search.get("q") ?? "").trim().slice(0, 100),
    sort,
    dir: search.get("dir") === "desc" ? ("desc" as const) : ("asc" as const),
    page,
    offset: (page - 1) * PAGE_SIZE,
    limit: PAGE_SIZE,
  };
}

export type ListParams<S extends string = string> = {
  q: string;
  sort: S;
  dir: "asc" | "desc";
  page: number;
  offset: number;
  limit: number;
};

/** A whole-number id filter from the URL, or null when absent or not a number. */
export function idFilter(url: URL, name: string): number | null {
  return plainPositiveInt(url.searchParams.get(name));
}

export function enumFilter<const T extends readonly string[]>(url: URL, name: string, values: T): T[number] | null {
  const value = url.searchParams.get(name);
  return value && (values as readonly string[]).includes(value) ? (value as T[number]) : null;
}

/** Escapes LIKE wildcards in a search term. */
export function likePattern(q: string): string {
  return `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}
